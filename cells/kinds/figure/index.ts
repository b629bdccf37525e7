export * from "./settings";
export { defineFigureCell, describeFigure } from "./define";
export { type CodeFigureValue, codeFigureValue } from "./code-figure";
export { mergePotentials } from "./merge-potentials";
export { type ReadyFigureSettings, readyFigure } from "./ready-view";
