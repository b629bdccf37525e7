export * from "./settings";
export { SMALL_SAMPLE, defineTransportCell, describeTransport } from "./define";
export { resolveCost, resolveEpsilonSetting, resolvePenalty, resolveSolveOptions } from "./resolve-transport";
export { type TransportCellValue, isTransportValue, transportInput } from "./transport-value";
