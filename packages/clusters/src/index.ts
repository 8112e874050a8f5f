export * from "./halos/index.js";
export * from "./constants.js";
export { integrate, gaussKronrod15 } from "./numerics/quadrature.js";
export type { QuadOptions } from "./numerics/quadrature.js";
export * from "./cosmology/index.js";
export * from "./profiles/index.js";
export * from "./scaling/index.js";
