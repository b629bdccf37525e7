export * from "./settings";
export { type TableCellValue, type TableColumnValue, defineTableCell, describeTable } from "./define";
