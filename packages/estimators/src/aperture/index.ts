export { apertureSum, checkApertureSpec, pixelAreaArcmin2 } from "./photometry.js";
export type { ApertureSpec, ApertureResult, ApertureFlag } from "./photometry.js";
export { apertureKernel, apertureVarianceFromPower, interpolatePower } from "./variance.js";
export type { PowerTable } from "./variance.js";
export { randomApertureScatter } from "./random.js";
export type { RandomApertureOptions, RandomApertureScatter } from "./random.js";
export { measureCatalogByIlc } from "./measure.js";
export type { IlcMeasureOptions, IlcMeasureResult } from "./measure.js";
export { besselJ1, discTransform, apertureVarianceRadial } from "./radial.js";
