import { TransportInputError } from "../../core/errors";
import { type PointMeasure, pointMeasure } from "../../core/measure";
import { DataImportError } from "./import-error";
import { type NumericTable, listNames } from "./numeric-table";
import type { NpyArray } from "./parse-npy";

/** Options of {@link tableToMeasure}. */
export interface TableToMeasureOptions {
  /**
   * Columns that hold the coordinates, in order (point dimension = their count).
   * Default: every column except the mass column.
   */
  coordinates?: readonly string[];
  /**
   * Column holding each point's mass (non-negative, positive total). Default:
   * "mass" when the table has it and no separate `mass` is given. `null`: no
   * mass column even if one is called "mass".
   */
  massColumn?: string | null;
  /**
   * Masses given apart from the table (e.g. a second .npy file): one per row;
   * an array must be 1-D (n,) or (n, 1). Cannot be combined with a mass column.
   * Without any mass, every point gets 1/n.
   */
  mass?: ArrayLike<number> | NpyArray;
  /** File name for messages. Default "table". */
  name?: string;
  /** File name of the separate `mass`, for messages about it. Default: `name`. */
  massName?: string;
  /** Name of the measure handed to core's pointMeasure (e.g. "source"). Default "measure". */
  measureName?: string;
}

/**
 * Builds a {@link PointMeasure} from a parsed table or a .npy array. A .npy
 * array's columns are named by their index: "0", "1", … (a 1-D array is one
 * column "0"), so `coordinates: ["0", "1"]` and `massColumn: "2"` work on it.
 *
 * Throws a {@link DataImportError} naming the file, and the row and column
 * where one applies, on: unknown or repeated columns, no coordinate column,
 * no rows, a coordinate that is not finite (NaN from a .npy file), a mass that
 * is negative or not finite, a zero total mass, and a separate mass array of
 * the wrong length or shape.
 */
export function tableToMeasure(table: NumericTable | NpyArray, options: TableToMeasureOptions = {}): PointMeasure {
  const { name: file = "table", measureName = "measure" } = options;
  const view = "shape" in table ? npyView(table, file) : tableView(table);
  const has = (column: string): boolean => view.columns.includes(column);

  if (options.massColumn !== undefined && options.massColumn !== null && !has(options.massColumn)) {
    throw new DataImportError({ file, column: options.massColumn, reason: `no such mass column; the columns are ${listNames(view.columns)}` });
  }
  if (options.mass !== undefined && typeof options.massColumn === "string") {
    throw new DataImportError({ file, column: options.massColumn, reason: "two sources of mass: a mass column and a separate mass array; give one" });
  }
  const massColumn = options.massColumn === undefined ? (options.mass === undefined && has("mass") ? "mass" : undefined) : (options.massColumn ?? undefined);
  if (options.mass !== undefined && options.massColumn === undefined && options.coordinates === undefined && has("mass")) {
    throw new DataImportError({ file, column: "mass", reason: 'a separate mass array was given but the table also has a "mass" column; pass massColumn (or null to ignore the column) or list the coordinates' });
  }

  const coordinates = options.coordinates ?? view.columns.filter((c) => c !== massColumn);
  if (coordinates.length === 0) {
    const why =
      options.coordinates !== undefined
        ? "the coordinates list is empty; name at least one column"
        : view.columns.length === 0
          ? "the table has no columns"
          : `the only column, ${JSON.stringify(massColumn)}, holds the mass; a point needs at least one coordinate`;
    throw new DataImportError({ file, reason: `no coordinate columns: ${why}` });
  }
  const coordIndex = coordinates.map((column, j) => {
    const k = view.columns.indexOf(column);
    if (k < 0) throw new DataImportError({ file, column, reason: `no such coordinate column; the columns are ${listNames(view.columns)}` });
    if (coordinates.indexOf(column) !== j) throw new DataImportError({ file, column, reason: "coordinate column listed twice" });
    if (column === massColumn) throw new DataImportError({ file, column, reason: "the column is both a coordinate and the mass" });
    return k;
  });

  const n = view.rowCount;
  if (n === 0) throw new DataImportError({ file, reason: "no data rows: a measure needs at least one point" });
  const dim = coordIndex.length;
  const points = new Float64Array(n * dim);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < dim; j++) {
      const v = view.get(i, coordIndex[j]);
      if (!Number.isFinite(v)) throw new DataImportError({ file, row: view.rowNumber(i), column: coordinates[j], reason: `coordinate must be a finite number, got ${v}` });
      points[i * dim + j] = v;
    }
  }

  let mass: Float64Array | undefined;
  if (massColumn !== undefined) {
    const k = view.columns.indexOf(massColumn);
    mass = new Float64Array(n);
    for (let i = 0; i < n; i++) mass[i] = checkedMass(view.get(i, k), file, view.rowNumber(i), massColumn);
  } else if (options.mass !== undefined) {
    mass = separateMass(options.mass, n, options.massName ?? file);
  }
  if (mass !== undefined && !mass.some((w) => w > 0)) {
    throw new DataImportError({ file, column: massColumn, reason: "total mass is zero: at least one point needs a positive mass" });
  }

  try {
    return pointMeasure(points, mass, { dim, name: measureName });
  } catch (error) {
    // Everything pointMeasure checks was checked above with file positions; this keeps the error tier if that ever drifts.
    if (error instanceof TransportInputError) throw new DataImportError({ file, reason: error.message }, { cause: error });
    throw error;
  }
}

/** Row-and-column access shared by parsed tables and .npy arrays. */
interface TableView {
  readonly columns: readonly string[];
  readonly rowCount: number;
  get(i: number, k: number): number;
  /** The row number for messages (line of a CSV, record of a JSON, 1-based row of an array). */
  rowNumber(i: number): number;
}

function tableView(table: NumericTable): TableView {
  const { columns, rows, rowNumbers } = table;
  return {
    columns,
    rowCount: rows.length,
    get: (i, k) => rows[i][k],
    rowNumber: (i) => rowNumbers?.[i] ?? i + 1,
  };
}

function npyView(array: NpyArray, file: string): TableView {
  const { shape, data } = array;
  if (shape.length !== 1 && shape.length !== 2) {
    throw new DataImportError({ file, reason: `an array of shape (${shape.join(", ")}) is not a point cloud; use (n,) or (n, d)` });
  }
  const cols = shape.length === 2 ? shape[1] : 1;
  return {
    columns: Array.from({ length: cols }, (_, k) => String(k)),
    rowCount: shape[0],
    get: (i, k) => data[i * cols + k],
    rowNumber: (i) => i + 1,
  };
}

function checkedMass(w: number, file: string, row: number, column: string | undefined): number {
  if (!Number.isFinite(w)) throw new DataImportError({ file, row, column, reason: `mass must be a finite number, got ${w}` });
  if (w < 0) throw new DataImportError({ file, row, column, reason: `mass must be >= 0, got ${w}` });
  return w;
}

function separateMass(mass: ArrayLike<number> | NpyArray, n: number, file: string): Float64Array {
  let values: ArrayLike<number>;
  if ("shape" in mass && "data" in mass) {
    const { shape } = mass;
    if (!(shape.length === 1 || (shape.length === 2 && shape[1] === 1))) {
      throw new DataImportError({ file, reason: `the separate mass array must have shape (n,) or (n, 1), got (${shape.join(", ")})` });
    }
    values = mass.data;
  } else {
    values = mass as ArrayLike<number>;
  }
  if (values.length !== n) throw new DataImportError({ file, reason: `the separate mass array has ${values.length} values for ${n} points` });
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = checkedMass(values[i], file, i + 1, undefined);
  return out;
}
