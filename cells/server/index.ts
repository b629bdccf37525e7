// The local server behind `couplet open` (Node only): the bundled editor and a JSON
// API over one folder's files, for this computer only. See docs/server.md.
export { type RunningServer, type StartServerOptions, startServer } from "./start-server";
export { HttpError } from "./http-error";
export { SERVER_LIMITS } from "./server-limits";
export { TOKEN_HEADER, tokenCookieName } from "./request-guard";
export { trustFilePath } from "./trust-list";
