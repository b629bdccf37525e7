// Entry of the browser editor (built by build.mjs to dist/editor/editor.js).
// Reads the session token from the page address, asks the local server which
// study to open, and starts the editor on it.
import { WorkerSolver } from "./run/worker-solver";
import { el, replaceChildren } from "./dom/element";
import { EditorApp } from "./page/editor-app";
import { showStartPage } from "./page/start-page";
import { ServerUnreachableError, httpStudyServer, tokenFromUrl } from "./save/server-api";

const TOKEN_KEY = "couplet.token";

function fatal(mount: HTMLElement, title: string, text: string): void {
  replaceChildren(mount, el("main", { class: "cp-start", role: "alert" }, el("h1", { text: title }), el("p", { text })));
}

async function start(): Promise<void> {
  const mount = document.getElementById("couplet") ?? document.body;
  // The token leaves the address bar (screenshots, shared links) but stays for reloads of this tab.
  const fromUrl = tokenFromUrl(location.href);
  if (fromUrl) sessionStorage.setItem(TOKEN_KEY, fromUrl);
  const token = fromUrl || sessionStorage.getItem(TOKEN_KEY) || "";
  const params = new URLSearchParams(location.search);
  const chosen = params.get("study");
  if (fromUrl) history.replaceState(null, "", chosen ? `?study=${encodeURIComponent(chosen)}` : location.pathname);
  const server = httpStudyServer(token);
  let session;
  try {
    session = await server.session();
  } catch (error) {
    const reason = error instanceof ServerUnreachableError && error.status === 403 ? "This page needs the link that `couplet open` printed (it ends in ?token=…)." : (error as Error).message;
    fatal(mount, "Couplet cannot reach its server", reason);
    return;
  }
  const path = chosen ?? (typeof session.studyPath === "string" ? session.studyPath : null);
  const open = (p: string) => {
    location.search = `?study=${encodeURIComponent(p)}`;
  };
  if (!path) {
    await showStartPage(mount, server, String(session.folder ?? "this folder"), open);
    return;
  }
  let stored;
  try {
    stored = await server.readStudy(path);
  } catch (error) {
    fatal(mount, `Cannot open ${path}`, (error as Error).message);
    return;
  }
  // As many solves at once as the machine has cores (at least 2: one long solve must not hold up the rest).
  const cores = Math.max(2, Math.min(8, navigator.hardwareConcurrency || 2));
  const solver = new WorkerSolver(() => new Worker(new URL("./solve-worker.js", import.meta.url), { type: "module" }), { keepIdle: cores, maxRunning: cores });
  try {
    new EditorApp({
      mount,
      server,
      path,
      text: stored.text,
      revision: stored.revision,
      trusted: stored.trusted ?? session.trusted === true,
      solve: (request, control) => solver.solve(request, control),
      storage: localStorage,
    });
  } catch (error) {
    fatal(mount, `${path} is not a study Couplet can open`, (error as Error).message);
  }
}

void start();
