/**
 * A request the server refuses or cannot serve, with the HTTP status to send.
 * `code` is a short stable word for programs (`token-missing`, `path-outside-root`);
 * `message` says what was wrong in plain words; `details` are extra JSON fields
 * merged into the reply (the issue list of a 422, the current text of a 409).
 */
export class HttpError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: Readonly<Record<string, unknown>>;

  constructor(status: number, code: string, message: string, details: Record<string, unknown> = {}) {
    super(message);
    this.name = "HttpError";
    this.status = status;
    this.code = code;
    this.details = details;
  }
}
