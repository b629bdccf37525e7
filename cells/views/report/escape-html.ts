/**
 * Escapes text for an HTML text node or a double-quoted attribute value:
 * `& < > " '` become character references. Every string the report writes that
 * did not come from the sanitiser goes through here.
 */
export function escapeHtml(text: string): string {
  return String(text).replace(/[&<>"']/g, (c) => ESCAPES[c]);
}

const ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };
