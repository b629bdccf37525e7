/** Suffix of study files (docs/format.md: conventionally NAME.couplet.json). */
export const STUDY_SUFFIX = ".couplet.json";

/** True when `path` names a study file by its suffix (case-sensitive, as written by Couplet). */
export function isStudyPath(path: string): boolean {
  return path.endsWith(STUDY_SUFFIX) && path.length > STUDY_SUFFIX.length && !path.endsWith(`/${STUDY_SUFFIX}`);
}

function extension(path: string): string {
  const name = path.slice(path.lastIndexOf("/") + 1);
  const dot = name.lastIndexOf(".");
  return dot <= 0 ? "" : name.slice(dot + 1).toLowerCase();
}

const DATA_TYPES: Readonly<Record<string, string>> = {
  csv: "text/csv; charset=utf-8",
  tsv: "text/tab-separated-values; charset=utf-8",
  json: "application/json; charset=utf-8",
  npy: "application/octet-stream",
};

/**
 * The data file kinds data cells import (docs/format.md, data cells from a file):
 * `{format, contentType}` by extension, or undefined for any other file.
 */
export function dataFileType(path: string): { format: string; contentType: string } | undefined {
  const ext = extension(path);
  return Object.hasOwn(DATA_TYPES, ext) ? { format: ext, contentType: DATA_TYPES[ext] } : undefined;
}

const ASSET_TYPES: Readonly<Record<string, string>> = {
  html: "text/html; charset=utf-8",
  js: "text/javascript; charset=utf-8",
  mjs: "text/javascript; charset=utf-8",
  css: "text/css; charset=utf-8",
  map: "application/json; charset=utf-8",
  json: "application/json; charset=utf-8",
  svg: "image/svg+xml",
  png: "image/png",
  ico: "image/x-icon",
  woff2: "font/woff2",
  wasm: "application/wasm",
  txt: "text/plain; charset=utf-8",
};

/** Content type of a file of the bundled editor, by extension; unknown kinds are sent as opaque bytes. */
export function assetContentType(path: string): string {
  return ASSET_TYPES[extension(path)] ?? "application/octet-stream";
}
