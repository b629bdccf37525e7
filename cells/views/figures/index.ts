export { couplingLinesFigure, type CouplingLinesFacts, type CouplingLinesInput } from "./coupling-lines";
export { convergenceFigure, type ConvergenceFacts, type ConvergenceHistory, type ConvergenceInput } from "./convergence";
export { type CommonFigureOptions, type FigureKeyEntry, type FigureName, type FigureSpec, isFigureSpec } from "./figure-spec";
export { formatCount, formatNumber, formatPercent } from "./format-number";
export { orderByCoordinate, planMatrixFigure, type PlanMatrixFacts, type PlanMatrixInput } from "./plan-matrix";
export { potentialsFigure, type PotentialsFacts, type PotentialsInput } from "./potentials";
export { sweepCurveFigure, type SweepCurveFacts, type SweepCurveInput, type SweepRow } from "./sweep-curve";
