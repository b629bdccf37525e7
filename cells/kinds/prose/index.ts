export * from "./settings";
export { type ProseCellValue, defineProseCell, describeProse } from "./define";
