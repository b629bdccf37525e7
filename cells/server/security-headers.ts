/**
 * Content-Security-Policy of the editor's own files (its page, scripts, styles and
 * workers; a worker takes the policy of its script's response, so the scripts carry
 * it too). Only this server may supply scripts, styles, images, fonts and workers
 * and receive connections, so even a code cell the user chose to run cannot send a
 * study's data to another host with fetch, an image or a form.
 *
 * Two relaxations, each needed by something the editor does:
 * - `script-src 'unsafe-eval'`: code cells are the user's JavaScript, compiled in the
 *   page with `new Function` / `AsyncFunction` (cells/runtime/compile-code-cell.ts);
 *   CSP treats that as eval. No inline scripts are allowed.
 * - `style-src 'unsafe-inline'`: the text editor (CodeMirror) and the figures
 *   (@observablehq/plot) add `<style>` elements and style attributes at run time.
 *   Styles cannot run code; the cost is that injected CSS could restyle the page.
 */
export const EDITOR_CSP = [
  "default-src 'self'",
  "script-src 'self' 'unsafe-eval'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join("; ");

/**
 * Content-Security-Policy of everything else (API replies, data files, error pages):
 * nothing may load or run, and the reply cannot be framed (a data file opened by
 * navigation is inert).
 */
export const LOCKED_CSP = "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'; sandbox";

/**
 * Headers sent on every response:
 * - `Cache-Control: no-store`: studies and data must not linger in a browser cache;
 * - `X-Content-Type-Options: nosniff`: a data file is never run as a script or style;
 * - `Referrer-Policy: no-referrer`: the page URL holds the token, so it must not leak
 *   to any link target;
 * - `Cross-Origin-Resource-Policy: same-origin`: other origins (other local ports
 *   included) cannot embed these responses as images or scripts;
 * - `Cross-Origin-Opener-Policy: same-origin` and `X-Frame-Options: DENY`: no other
 *   page keeps a handle on the editor window or frames it.
 */
export function securityHeaders(kind: "editor" | "locked"): Record<string, string> {
  return {
    "Cache-Control": "no-store",
    "X-Content-Type-Options": "nosniff",
    "Referrer-Policy": "no-referrer",
    "Cross-Origin-Resource-Policy": "same-origin",
    "Cross-Origin-Opener-Policy": "same-origin",
    "X-Frame-Options": "DENY",
    "Content-Security-Policy": kind === "editor" ? EDITOR_CSP : LOCKED_CSP,
  };
}
