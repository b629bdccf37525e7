import type { PointMeasure } from "../../core/measure";
import { DataImportError } from "./import-error";
import { listNames } from "./numeric-table";
import type { NpyArray } from "./parse-npy";
import { type DataFormat, readTable } from "./read-table";
import { tableToMeasure } from "./table-to-measure";

/** Options of {@link readMeasureFile}. */
export interface ReadMeasureFileOptions {
  /** "auto" (default) chooses by extension (.csv, .tsv, .json, .npy). */
  format?: DataFormat | "auto";
  /**
   * Coordinate columns, in order. Default: every column except the mass
   * column. When given, only these (and the mass column) must hold numbers,
   * so a CSV or JSON file may keep label columns. For .npy: "0", "1", ….
   */
  coordinates?: readonly string[];
  /** Mass column. Default "mass" when present; `null` ignores any mass column. */
  massColumn?: string | null;
  /**
   * A second file with one mass per point (same formats): a 1-D or (n, 1)
   * .npy array, or a table whose "mass" column — or only column — is used.
   */
  massFile?: string;
  /** Directory that relative paths (of both files) start from. Default: the working directory. */
  relativeTo?: string;
  /** Name of the measure inside core messages (e.g. "source"). Default "measure". */
  name?: string;
}

/**
 * Reads a point cloud with optional masses from a CSV, TSV, JSON or .npy file
 * (synchronous; Node only). See {@link readTable} for parsing and
 * {@link tableToMeasure} for how columns become coordinates and masses.
 * Every failure is a {@link DataImportError} naming the file (as given),
 * and the row and column where one applies; a missing file names the
 * absolute path looked at.
 */
export function readMeasureFile(path: string, options: ReadMeasureFileOptions = {}): PointMeasure {
  const { format, coordinates, massColumn, massFile, relativeTo, name } = options;
  // With named coordinates only the needed columns are parsed, so label columns may stay in the file.
  const keepMass = massColumn === null || massFile !== undefined ? [] : [massColumn ?? "mass"];
  const selection =
    coordinates === undefined
      ? {}
      : typeof massColumn === "string"
        ? { columns: [...coordinates, massColumn] }
        : { columns: [...coordinates], optionalColumns: keepMass.filter((c) => !coordinates.includes(c)) };
  const { table } = readTable(path, { format, relativeTo, ...selection });
  const mass = massFile === undefined ? undefined : readMass(massFile, relativeTo);
  return tableToMeasure(table, { coordinates, massColumn, mass, name: path, massName: massFile, measureName: name });
}

function readMass(path: string, relativeTo: string | undefined): ArrayLike<number> | NpyArray {
  const { table } = readTable(path, { relativeTo });
  if ("shape" in table) return table;
  const column = table.columns.includes("mass") ? "mass" : table.columns.length === 1 ? table.columns[0] : undefined;
  if (column === undefined) {
    throw new DataImportError({ file: path, reason: `a mass file needs a "mass" column or exactly one column; the columns are ${listNames(table.columns)}` });
  }
  const k = table.columns.indexOf(column);
  // Checked here so the message points at the line of this file; tableToMeasure only sees the numbers.
  table.rows.forEach((row, i) => {
    if (row[k] < 0) throw new DataImportError({ file: path, row: table.rowNumbers?.[i] ?? i + 1, column, reason: `mass must be >= 0, got ${row[k]}` });
  });
  return table.rows.map((row) => row[k]);
}
