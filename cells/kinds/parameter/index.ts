export * from "./settings";
export { defineParameterCell, describeParameter } from "./define";
