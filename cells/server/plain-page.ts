/**
 * A small self-contained HTML page (no scripts, no outside resources) for messages
 * such as "not allowed" or "the editor is not built". Text is escaped; a span in
 * backquotes is shown as code.
 */
export function plainPage(title: string, paragraphs: readonly string[]): string {
  const escape = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${escape(title)}</title>
<style>body{font:16px/1.5 system-ui,sans-serif;max-width:40em;margin:4em auto;padding:0 1em}code{background:#eee;padding:0 .2em}</style>
</head><body><h1>${escape(title)}</h1>
${paragraphs.map((p) => `<p>${escape(p).replace(/`([^`]+)`/g, "<code>$1</code>")}</p>`).join("\n")}
</body></html>
`;
}
