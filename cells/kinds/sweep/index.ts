export * from "./settings";
export { defineSweepCell, describeSweep } from "./define";
export { type SweepPlan, resolveSweepPlan } from "./resolve-sweep";
export { type SweepEnvironment, runSweep } from "./run-sweep";
export { type SweepProblem, checkSweepApplies, drawsSamples, sweepProblem } from "./sweep-problem";
export { type SweepCellValue, type SweepRowValue, isSweepValue } from "./sweep-value";
