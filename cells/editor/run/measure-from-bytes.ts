import type { PointMeasure } from "../../../core/measure";
import { DataImportError } from "../../data/import-error";
import type { NumericTable } from "../../data/numeric-table";
import { parseDelimited } from "../../data/parse-delimited";
import { parseJsonTable } from "../../data/parse-json-table";
import { type NpyArray, parseNpy } from "../../data/parse-npy";
import { tableToMeasure } from "../../data/table-to-measure";
import type { MeasureFileRequest } from "../../kinds/define-context";
import { formatFromPath } from "../../kinds/data/settings";

/**
 * A point cloud from a data file's bytes, as the Node reader builds it from the
 * disk (cells/data/read-measure-file.ts): the format from the request or the
 * extension, UTF-8 text for CSV/TSV/JSON, only the named columns parsed (so label
 * columns may stay in the file), and `mass` (default: a column named "mass" when
 * there is one). The browser gets the bytes from the server's /api/data.
 * Throws a DataImportError naming `path`.
 */
export function measureFromBytes(bytes: Uint8Array, path: string, request: MeasureFileRequest): PointMeasure {
  const format = request.format ?? formatFromPath(path);
  if (format === undefined) {
    throw new DataImportError({ file: path, reason: "cannot tell the format from the extension; use .csv, .tsv, .json or .npy, or give the format" });
  }
  const { columns, mass } = request;
  const selection =
    columns === undefined
      ? {}
      : mass !== undefined
        ? { columns: [...columns, mass] }
        : { columns: [...columns], optionalColumns: columns.includes("mass") ? [] : ["mass"] };
  let table: NumericTable | NpyArray;
  if (format === "npy") table = parseNpy(bytes, { name: path });
  else {
    const text = new TextDecoder("utf-8").decode(bytes);
    table =
      format === "json"
        ? parseJsonTable(text, { ...selection, name: path })
        : parseDelimited(text, { ...selection, delimiter: format === "tsv" ? "\t" : ",", name: path });
  }
  return tableToMeasure(table, { coordinates: columns, massColumn: mass, name: path, measureName: request.name });
}

/**
 * The path of a study's data file as the server serves it: `path` (relative to the
 * study file's folder, "/"-separated) joined to the folder of `studyPath` (relative
 * to the served folder), with "." and ".." segments resolved. Returns undefined
 * when ".." would leave the served folder (the server would refuse it anyway).
 */
export function servedDataPath(studyPath: string, path: string): string | undefined {
  const folder = studyPath.split("/").slice(0, -1);
  const out = [...folder];
  for (const segment of path.split("/")) {
    if (segment === "" || segment === ".") continue;
    if (segment === "..") {
      if (out.length === 0) return undefined;
      out.pop();
    } else out.push(segment);
  }
  return out.join("/");
}
