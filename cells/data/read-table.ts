import { readFileSync } from "node:fs";
import { extname, resolve } from "node:path";
import { DataImportError } from "./import-error";
import type { ColumnSelection, NumericTable } from "./numeric-table";
import { parseDelimited } from "./parse-delimited";
import { parseJsonTable } from "./parse-json-table";
import { type NpyArray, parseNpy } from "./parse-npy";

/** File formats the importer reads. */
export type DataFormat = "csv" | "tsv" | "json" | "npy";

/** Options of {@link readTable}. */
export interface ReadTableOptions extends ColumnSelection {
  /** "auto" (default) chooses by extension: see {@link formatFromPath}. */
  format?: DataFormat | "auto";
  /** Directory that relative paths start from. Default: the process's working directory. */
  relativeTo?: string;
}

/** What {@link readTable} read. */
export interface DataFile {
  /** Absolute path that was read. */
  readonly path: string;
  readonly format: DataFormat;
  /** A table for CSV, TSV and JSON; an array for .npy (column selection does not apply to it). */
  readonly table: NumericTable | NpyArray;
}

const EXTENSIONS: Record<string, DataFormat> = { ".csv": "csv", ".tsv": "tsv", ".json": "json", ".npy": "npy" };

/** Format by extension, case-insensitive: .csv, .tsv, .json, .npy; undefined for any other. */
export function formatFromPath(path: string): DataFormat | undefined {
  return EXTENSIONS[extname(path).toLowerCase()];
}

/**
 * Reads and parses one data file (synchronously: a thin wrapper over
 * `fs.readFileSync` and the pure parsers). Messages name the file as the
 * caller wrote `path`; a missing file also names the absolute path looked at.
 * Text is decoded as UTF-8 (a byte-order mark is dropped).
 * Throws {@link DataImportError}.
 */
export function readTable(path: string, options: ReadTableOptions = {}): DataFile {
  const { format = "auto", relativeTo = process.cwd() } = options;
  const absolute = resolve(relativeTo, path);
  const chosen = format === "auto" ? formatFromPath(path) : format;
  if (chosen === undefined) {
    throw new DataImportError({ file: path, reason: `cannot tell the format from the extension ${JSON.stringify(extname(path))}; use .csv, .tsv, .json or .npy, or give the format` });
  }
  const bytes = readBytes(path, absolute);
  const selection: ColumnSelection = { columns: options.columns, optionalColumns: options.optionalColumns };
  let table: NumericTable | NpyArray;
  if (chosen === "npy") {
    table = parseNpy(bytes, { name: path });
  } else {
    const text = new TextDecoder("utf-8").decode(bytes);
    table =
      chosen === "json"
        ? parseJsonTable(text, { ...selection, name: path })
        : parseDelimited(text, { ...selection, delimiter: chosen === "tsv" ? "\t" : ",", name: path });
  }
  return { path: absolute, format: chosen, table };
}

function readBytes(path: string, absolute: string): Uint8Array {
  try {
    return readFileSync(absolute);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const reason =
      code === "ENOENT"
        ? `file not found (looked for ${absolute})`
        : code === "EISDIR"
          ? `is a directory, not a file (${absolute})`
          : code === "EACCES" || code === "EPERM"
            ? `permission denied reading ${absolute}`
            : `cannot read ${absolute}: ${(error as Error).message}`;
    throw new DataImportError({ file: path, reason }, { cause: error });
  }
}
