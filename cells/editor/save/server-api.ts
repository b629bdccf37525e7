/**
 * The browser's side of the local study server (`couplet open`, cells/server/).
 * Every request carries the per-run token in the `x-couplet-token` header; the
 * page learns the token from its own URL (`?token=…`). Plain data in, plain data
 * out: the editor's save logic is written against {@link StudyServer}, so tests
 * and a static preview can hand it another implementation.
 */

/** What the server says about this editing session. */
export interface SessionInfo {
  /** Path of the study, relative to the folder the server serves. */
  readonly studyPath: string;
  /** Whether the user has said they trust this study's code (or wrote it here). */
  readonly trusted: boolean;
  /** Anything else the server adds (version, folder, …). */
  readonly [extra: string]: unknown;
}

/** A study's text as stored, with the revision a later write must name. */
export interface StoredStudy {
  readonly text: string;
  readonly revision: string;
  /** Whether the folder's trust list holds this study (when the server says). */
  readonly trusted?: boolean;
}

/** The files of the opened folder (GET /api/files). */
export interface FolderFiles {
  readonly studies: readonly { readonly path: string; readonly trusted: boolean }[];
}

/** The outcome of a write. */
export type WriteOutcome =
  /** Written; `text` is the canonical text the server stored when it differs from the text sent. */
  | { readonly kind: "saved"; readonly revision: string; readonly text?: string }
  /**
   * The file changed on disk since `baseRevision`: here is what it holds now
   * (`currentText` null: the file was deleted meanwhile).
   */
  | { readonly kind: "conflict"; readonly currentRevision: string | null; readonly currentText: string | null }
  /** The server refused the text as a study (should not happen: the editor validates first). */
  | { readonly kind: "invalid"; readonly issues: readonly { readonly path: string; readonly message: string }[] };

/** The calls the editor makes. Network failures reject with a {@link ServerUnreachableError}. */
export interface StudyServer {
  session(): Promise<SessionInfo>;
  readStudy(path: string): Promise<StoredStudy>;
  /** `baseRevision` null: the file must not exist yet (writing a deleted study again). */
  writeStudy(path: string, text: string, baseRevision: string | null): Promise<WriteOutcome>;
  /** Writes `text` as a new file beside `path` (the server picks a free name) and returns where. */
  copyStudy(path: string, text: string): Promise<{ readonly path: string; readonly revision?: string }>;
  /** Raw bytes of a data file, `path` relative to the served folder. */
  readData(path: string): Promise<Uint8Array>;
  /** Records that the user trusts the study's code. */
  trust(path: string): Promise<void>;
  /** The studies in the opened folder. */
  listFiles(): Promise<FolderFiles>;
  /** Writes the starter study at `path` (a new file) and returns it. */
  createStudy(path: string, title?: string): Promise<StoredStudy & { readonly path: string }>;
}

/** The server could not be reached, or answered with an unexpected status. */
export class ServerUnreachableError extends Error {
  /** HTTP status when there was an answer; undefined when the request itself failed. */
  readonly status?: number;
  constructor(message: string, status?: number) {
    super(message);
    this.name = "ServerUnreachableError";
    if (status !== undefined) this.status = status;
  }
}

/** The header that carries the session token. */
export const TOKEN_HEADER = "x-couplet-token";

/** The token in a page URL's `?token=` parameter, or "" when there is none. */
export function tokenFromUrl(url: string): string {
  try {
    return new URL(url).searchParams.get("token") ?? "";
  } catch {
    return "";
  }
}

/**
 * A {@link StudyServer} over `fetch`. `base` is the server's origin (default: the
 * page's); `fetchImpl` is injectable for tests.
 */
export function httpStudyServer(token: string, base = "", fetchImpl: typeof fetch = (...args) => fetch(...args)): StudyServer {
  const call = async (method: string, path: string, body?: unknown): Promise<Response> => {
    let response: Response;
    try {
      response = await fetchImpl(`${base}${path}`, {
        method,
        headers: { [TOKEN_HEADER]: token, ...(body === undefined ? {} : { "content-type": "application/json" }) },
        ...(body === undefined ? {} : { body: JSON.stringify(body) }),
        cache: "no-store",
      });
    } catch (error) {
      throw new ServerUnreachableError(`The Couplet server did not answer (${(error as Error).message || "network error"}); is \`couplet open\` still running?`);
    }
    return response;
  };
  const json = async <T>(response: Response, what: string): Promise<T> => {
    if (!response.ok) throw new ServerUnreachableError(`${what}: the server answered ${response.status} ${await errorText(response)}`.trim(), response.status);
    return (await response.json()) as T;
  };
  const q = (path: string) => `?path=${encodeURIComponent(path)}`;
  return {
    async session() {
      return json<SessionInfo>(await call("GET", "/api/session"), "reading the session");
    },
    async readStudy(path) {
      return json<StoredStudy>(await call("GET", `/api/study${q(path)}`), `reading ${path}`);
    },
    async writeStudy(path, text, baseRevision) {
      const response = await call("PUT", `/api/study${q(path)}`, { text, baseRevision });
      if (response.status === 409) {
        const body = (await response.json()) as { currentRevision?: string | null; currentText?: string | null };
        return { kind: "conflict", currentRevision: body.currentRevision ?? null, currentText: body.currentText ?? null };
      }
      if (response.status === 422) {
        const body = (await response.json()) as { issues?: { path: string; message: string }[] };
        return { kind: "invalid", issues: body.issues ?? [] };
      }
      const body = await json<{ revision: string; text?: string }>(response, `saving ${path}`);
      return { kind: "saved", revision: body.revision, ...(typeof body.text === "string" ? { text: body.text } : {}) };
    },
    async copyStudy(path, text) {
      return json<{ path: string; revision?: string }>(await call("POST", "/api/study/copy", { path, text }), `saving a copy of ${path}`);
    },
    async readData(path) {
      const response = await call("GET", `/api/data${q(path)}`);
      if (!response.ok) throw new ServerUnreachableError(`reading ${path}: the server answered ${response.status} ${await errorText(response)}`.trim(), response.status);
      return new Uint8Array(await response.arrayBuffer());
    },
    async listFiles() {
      return json<FolderFiles>(await call("GET", "/api/files"), "listing the folder");
    },
    async createStudy(path, title) {
      return json<StoredStudy & { path: string }>(await call("POST", "/api/new", { path, ...(title === undefined ? {} : { title }) }), `creating ${path}`);
    },
    async trust(path) {
      const response = await call("POST", "/api/trust", { path });
      if (!response.ok) throw new ServerUnreachableError(`trusting ${path}: the server answered ${response.status}`, response.status);
    },
  };
}

async function errorText(response: Response): Promise<string> {
  try {
    const text = await response.text();
    try {
      const body = JSON.parse(text) as { error?: unknown; message?: unknown };
      const message = body.error ?? body.message;
      if (typeof message === "string") return `(${message})`;
    } catch {
      // not JSON: show the text itself
    }
    return text ? `(${text.slice(0, 200)})` : "";
  } catch {
    return "";
  }
}
