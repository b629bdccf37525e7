/**
 * Offers `text` to the user as a file download named `name`: a Blob URL clicked
 * through a temporary link, revoked once the browser has taken it. No server
 * round trip, so downloads work while the server is unreachable too.
 */
export function downloadText(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type: `${type};charset=utf-8` }));
  const link = document.createElement("a");
  link.href = url;
  link.download = name;
  link.rel = "noopener";
  link.style.display = "none";
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
