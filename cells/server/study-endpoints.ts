import type { IncomingMessage } from "node:http";
import { basename, dirname, join } from "node:path";
import { StudyFormatError, parseStudy, serializeStudy } from "../document";
import type { StudyDocument } from "../document/study-types";
import { saveStudyFile } from "../document/study-file";
import { starterStudy } from "../study/starter-study";
import { isStudyPath } from "./content-types";
import { draftName } from "./draft-name";
import { HttpError } from "./http-error";
import { readJsonBody } from "./read-body";
import { pathSegments, relativeToRoot, resolveInRoot } from "./root-path";
import type { ServerContext } from "./server-context";
import { SERVER_LIMITS } from "./server-limits";
import { sameContent } from "./study-revision";
import { readStudyText } from "./study-text";
import { addToTrustList, readTrustList, trustFilePath } from "./trust-list";
import { writeFileAtomic } from "./write-file-atomic";

/** A JSON reply: HTTP status and body. */
export interface ApiReply {
  readonly status: number;
  readonly body: unknown;
}

/** The real path of a study named by a request, checked to be inside the root and to end in `.couplet.json`. */
export async function resolveStudy(ctx: ServerContext, path: unknown, allowMissing = false): Promise<{ absolute: string; relative: string; exists: boolean }> {
  // Confinement first: a path that leaves the folder is refused as such (403), whatever its name.
  pathSegments(path);
  if (typeof path === "string" && !isStudyPath(path)) throw new HttpError(400, "not-a-study", `path: a study file name ends in .couplet.json, got ${JSON.stringify(path)}`);
  const { absolute, exists } = await resolveInRoot(ctx.root, path, { allowMissing });
  const relative = relativeToRoot(ctx.root, absolute);
  // A link may lead inside the folder but to another kind of file: check the real name too.
  if (!isStudyPath(relative)) throw new HttpError(400, "not-a-study", `path: ${JSON.stringify(path)} leads to ${JSON.stringify(relative)}, which is not a .couplet.json file`);
  return { absolute, relative, exists };
}

/** Whether the study at `relative` (a real path relative to the root) is in the folder's trust list. */
export async function isTrusted(ctx: ServerContext, relative: string): Promise<boolean> {
  return (await readTrustList(ctx.root)).studies.has(relative);
}

function parseOr422(text: string, path: string): StudyDocument {
  try {
    return parseStudy(text, { path });
  } catch (error) {
    if (error instanceof StudyFormatError) {
      throw new HttpError(422, "invalid-study", `${path}: not a valid study (${error.issues.length === 1 ? "1 problem" : `${error.issues.length} problems`})`, {
        issues: error.issues,
      });
    }
    throw error;
  }
}

function textField(body: Record<string, unknown>, field: string): string {
  const value = body[field];
  if (typeof value !== "string") throw new HttpError(400, "bad-request", `${field}: must be a string`);
  return value;
}

/** GET /api/study?path=P → `{path, text, revision, trusted}`. */
export async function getStudy(ctx: ServerContext, query: URLSearchParams): Promise<ApiReply> {
  const study = await resolveStudy(ctx, query.get("path") ?? undefined);
  const stored = await readStudyText(study.absolute, SERVER_LIMITS.studyBytes);
  if (!stored) throw new HttpError(404, "not-found", `path: ${JSON.stringify(study.relative)} does not exist`);
  return { status: 200, body: { path: study.relative, text: stored.text, revision: stored.revision, trusted: await isTrusted(ctx, study.relative) } };
}

/**
 * PUT /api/study?path=P with `{text, baseRevision}`: validates the text (422 with
 * `issues`), refuses with 409 `{currentRevision, currentText}` if the file no longer
 * holds `baseRevision` (null for "create: must not exist yet"; a file deleted
 * meanwhile answers `currentRevision: null, currentText: null`), else saves with
 * saveStudyFile (canonical text, atomic, `.previous` backup) →
 * `{path, revision, written, backup, canonical, text?}` where `text` (the saved
 * canonical text) is present only when it differs from the text sent.
 */
export async function putStudy(ctx: ServerContext, req: IncomingMessage, query: URLSearchParams): Promise<ApiReply> {
  const study = await resolveStudy(ctx, query.get("path") ?? undefined, true);
  const body = await readJsonBody(req, SERVER_LIMITS.studyBytes);
  const text = textField(body, "text");
  const base = body.baseRevision;
  if (base !== null && typeof base !== "string") throw new HttpError(400, "bad-request", "baseRevision: must be the revision the text was based on (a string), or null to create a new file");
  const document = parseOr422(text, study.relative);
  return ctx.serialize(study.absolute, async () => {
    const current = await readStudyText(study.absolute, SERVER_LIMITS.studyBytes);
    const conflict =
      base === null ? current !== null : current === null || !sameContent(base, current.revision);
    if (conflict) {
      throw new HttpError(409, "changed-on-disk", current === null ? `${study.relative} was deleted since it was opened` : `${study.relative} was changed by another program since it was opened`, {
        currentRevision: current?.revision ?? null,
        currentText: current?.text ?? null,
      });
    }
    // A study trusted before this save stays trusted: the new bytes come from the user's editor.
    const wasTrusted = current !== null && (await isTrusted(ctx, study.relative));
    const report = await saveStudyFile(study.absolute, document);
    if (wasTrusted) await ctx.serialize(trustFilePath(), () => addToTrustList(ctx.root, study.relative));
    const saved = await readStudyText(study.absolute, SERVER_LIMITS.studyBytes);
    if (!saved) throw new Error(`${study.relative} vanished right after saving`);
    const canonical = saved.text === text;
    return {
      status: 200,
      body: {
        path: study.relative,
        revision: saved.revision,
        written: report.written,
        backup: report.backupPath === null ? null : relativeToRoot(ctx.root, report.backupPath),
        canonical,
        ...(canonical ? {} : { text: saved.text }),
      },
    };
  });
}

/** Writes `document` under the first free draft name beside `absolute`; returns its real path. */
async function writeDraft(absolute: string, bytes: Uint8Array): Promise<string> {
  for (let n = 2; n <= 999; n++) {
    const candidate = join(dirname(absolute), draftName(basename(absolute), n));
    try {
      await writeFileAtomic(candidate, bytes, { exclusive: true });
      return candidate;
    } catch (error) {
      if ((error as { code?: string }).code !== "EEXIST") throw error;
    }
  }
  throw new HttpError(409, "no-free-name", "drafts 2 to 999 of this study all exist; rename or remove some");
}

/**
 * POST /api/study/copy `{path, text}`: saves the (valid) text as a new file beside
 * `path`, named `NAME (draft N).couplet.json` with the smallest free N ≥ 2, never
 * replacing a file → 201 `{path, revision, trusted}`. The copy is trusted when the
 * study it was copied from is.
 */
export async function copyStudy(ctx: ServerContext, req: IncomingMessage): Promise<ApiReply> {
  const body = await readJsonBody(req, SERVER_LIMITS.studyBytes);
  const source = await resolveStudy(ctx, body.path, true);
  const document = parseOr422(textField(body, "text"), source.relative);
  const written = await writeDraft(source.absolute, new TextEncoder().encode(serializeStudy(document)));
  const relative = relativeToRoot(ctx.root, written);
  const trusted = await isTrusted(ctx, source.relative);
  if (trusted) await ctx.serialize(trustFilePath(), () => addToTrustList(ctx.root, relative));
  const stored = await readStudyText(written, SERVER_LIMITS.studyBytes);
  return { status: 201, body: { path: relative, revision: stored?.revision ?? null, trusted } };
}

/**
 * POST /api/new `{path, title?}`: writes the starter study (cells/study/starter-study.ts)
 * at `path`, refusing with 409 `exists` rather than replacing a file, and adds it to
 * the trust list (it was made here) → 201 `{path, text, revision, trusted: true}`.
 */
export async function newStudy(ctx: ServerContext, req: IncomingMessage): Promise<ApiReply> {
  const body = await readJsonBody(req, SERVER_LIMITS.smallBodyBytes);
  const study = await resolveStudy(ctx, body.path, true);
  if (body.title !== undefined && typeof body.title !== "string") throw new HttpError(400, "bad-request", "title: must be a string");
  const exists = () => new HttpError(409, "exists", `${study.relative} exists already; choose another name`);
  if (study.exists) throw exists();
  const text = serializeStudy(starterStudy(typeof body.title === "string" ? { title: body.title } : {}));
  try {
    await writeFileAtomic(study.absolute, new TextEncoder().encode(text), { exclusive: true });
  } catch (error) {
    if ((error as { code?: string }).code === "EEXIST") throw exists();
    throw error;
  }
  await ctx.serialize(trustFilePath(), () => addToTrustList(ctx.root, study.relative));
  const stored = await readStudyText(study.absolute, SERVER_LIMITS.studyBytes);
  return { status: 201, body: { path: study.relative, text: stored?.text ?? text, revision: stored?.revision ?? null, trusted: true } };
}

/** POST /api/trust `{path}`: adds an existing study to the trust list → `{path, trusted: true}`. */
export async function trustStudy(ctx: ServerContext, req: IncomingMessage): Promise<ApiReply> {
  const body = await readJsonBody(req, SERVER_LIMITS.smallBodyBytes);
  const study = await resolveStudy(ctx, body.path);
  await ctx.serialize(trustFilePath(), () => addToTrustList(ctx.root, study.relative));
  return { status: 200, body: { path: study.relative, trusted: true } };
}
