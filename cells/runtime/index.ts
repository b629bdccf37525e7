export type { CellContext, CellDefinition, CellState, FailureCause } from "./cell-definition";
export { CodeCellCompileError, compileCodeCell } from "./compile-code-cell";
export { freeNames } from "./free-names";
export { STANDARD_GLOBAL_NAMES } from "./global-resolver";
export type { CodeCellSyntaxError } from "./parse-code-cell";
export type { PortableSolveOptions, SolveRequest } from "./solve-protocol";
export { type OffThreadControl, type SolveWorkerPool, createSolveWorkerPool, shouldSolveOffThread, solveOffThread, solveWorkerUrl } from "./solve-off-thread";
export { RESERVED_NAMES, StudyEngine, type StudyEngineOptions } from "./study-engine";
