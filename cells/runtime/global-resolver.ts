/**
 * Standard JavaScript built-ins every cell may use without declaring them
 * (ECMA-262 §19 "The Global Object": value properties, functions, constructors and
 * namespace objects), minus the ones left out on purpose:
 * - `eval`, `Function`, `globalThis`: they reach every real global, which defeats
 *   catching typos as unknown names;
 * - `console`, timers, `fetch`: a cell's output is its value; printing from a study
 *   would interleave with the command line's own output and never show in the editor.
 * This list is about catching mistakes, not a security boundary: a determined
 * cell can still reach the real globals through constructors.
 */
export const STANDARD_GLOBAL_NAMES: readonly string[] = [
  "undefined", "NaN", "Infinity",
  "isFinite", "isNaN", "parseFloat", "parseInt",
  "encodeURI", "encodeURIComponent", "decodeURI", "decodeURIComponent",
  "Object", "Array", "Number", "String", "Boolean", "Symbol", "BigInt",
  "Math", "JSON", "Reflect", "Intl", "Proxy",
  "Map", "Set", "WeakMap", "WeakSet", "WeakRef",
  "Date", "RegExp", "Promise",
  "Error", "TypeError", "RangeError", "SyntaxError", "ReferenceError", "EvalError", "URIError", "AggregateError",
  "ArrayBuffer", "DataView",
  "Float64Array", "Float32Array", "Int8Array", "Int16Array", "Int32Array",
  "Uint8Array", "Uint8ClampedArray", "Uint16Array", "Uint32Array", "BigInt64Array", "BigUint64Array",
  // Not ECMA-262 but in every browser and in Node: deep copies of cell values.
  "structuredClone",
];

/** Thrown (inside the runtime) for a name no cell defines and no allowed global provides. */
export class UnknownNameError extends Error {
  /** The unresolved name. */
  readonly unknownName: string;
  constructor(name: string) {
    super(`${name} is not defined`);
    this.name = "UnknownNameError";
    this.unknownName = name;
  }
}

/**
 * A global resolver for `new Runtime(builtins, resolver)`: returns the value of an
 * allowed global (the {@link STANDARD_GLOBAL_NAMES} taken from `globalThis`, then
 * `globals`, which win on a clash) and throws {@link UnknownNameError} for any other
 * name, so a typo fails instead of silently reading a real global.
 */
export function globalResolver(globals: Readonly<Record<string, unknown>> = {}): { resolve: (name: string) => unknown; has: (name: string) => boolean } {
  const allowed = new Map<string, unknown>();
  const host = globalThis as Record<string, unknown>;
  for (const name of STANDARD_GLOBAL_NAMES) if (name in host) allowed.set(name, host[name]);
  for (const name of Object.keys(globals)) allowed.set(name, globals[name]);
  return {
    resolve(name) {
      if (allowed.has(name)) return allowed.get(name);
      throw new UnknownNameError(name);
    },
    has: (name) => allowed.has(name),
  };
}
