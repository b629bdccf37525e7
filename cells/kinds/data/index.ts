export * from "./settings";
export { defineDataCell, describeData } from "./define";
export { type DataEnvironment, drawData } from "./draw-data";
export { type ResolvedComponent, mixtureDensity } from "./grid-density";
