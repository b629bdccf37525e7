// The transport core as code cells see it: the global `core` in every study is
// this module's namespace (`core.solveTransport(a, b, {kind: "sqeuclidean"},
// {method: "exact"})`). Only the public entry points: measures, costs, the one
// solve call, comparators, generators with seeded randomness, plan readers.
// Re-exports only; each function's documentation is in core/.
export { CORE_VERSION } from "../../core/version";
export { TransportInputError } from "../../core/errors";
export { solveTransport } from "../../core/solve";
export { checkMass, gridMeasure, measureDimension, measurePoints, normalizeMeasure, pointMeasure, supportSize, totalMass } from "../../core/measure";
export { costExponent, costMatrix, costScale, resolveEpsilon } from "../../core/cost";
export { zeroMatrix } from "../../core/matrix";
export { gaussianMixture, gridHistogram, ring, sampleWithoutReplacement, subsample, twoMoons, uniformBox } from "../../core/generators";
export { normalDraw, parkMiller, seededRandom } from "../../core/random";
export { energyDistance, mmd } from "../../core/energy-distance";
export { slicedWasserstein } from "../../core/sliced";
export { gaussianEntropicOT, gaussianFit, gaussianSinkhornDivergence, gaussianW2 } from "../../core/gaussian";
export { generalizedKL } from "../../core/kl";
export { planDense, planEntries, planMarginals, planRow } from "../../core/plan";
