// The pure, DOM-free and fs-free parts of data import, safe for the browser bundle.
// The Node file readers are imported by path: "./read-table" and "./read-measure-file".
export { DataImportError, type DataImportProblem, quoteCell } from "./import-error";
export type { ColumnSelection, NumericTable } from "./numeric-table";
export { parseDelimited, type ParseDelimitedOptions } from "./parse-delimited";
export { parseJsonTable, type ParseJsonTableOptions } from "./parse-json-table";
export { parseNpy, type NpyArray, type ParseNpyOptions } from "./parse-npy";
export { npyElementType, type NpyElementType } from "./npy-dtype";
export { tableToMeasure, type TableToMeasureOptions } from "./table-to-measure";
