export * from "./settings";
export { defineCodeCell, describeCode } from "./define";
export { codeComputation } from "./code-computation";
