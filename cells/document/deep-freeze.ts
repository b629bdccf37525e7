/**
 * Freezes a JSON-like value and everything inside it, so that a study handed
 * out cannot be changed behind the document's back. Already frozen parts are
 * not walked again (updates share unchanged parts with the previous study).
 * Returns the value itself.
 */
export function deepFreeze<T>(value: T): T {
  if (typeof value !== "object" || value === null || Object.isFrozen(value)) return value;
  Object.freeze(value);
  for (const item of Object.values(value)) deepFreeze(item);
  return value;
}
