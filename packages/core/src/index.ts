export { UmbraError, isUmbraError, requireFinite } from "./errors.js";
export type { UmbraErrorCode, ErrorPlace } from "./errors.js";
export { createRng, logFactorial } from "./rng.js";
export type { Rng } from "./rng.js";
export {
  MAP_UNITS,
  isMapUnit,
  RAD_PER_DEG,
  RAD_PER_ARCMIN,
  ARCMIN2_PER_SR,
  arcminToRad,
  radToArcmin,
  degToRad,
  radToDeg,
  fwhmToSigma,
} from "./units.js";
export type { MapUnit } from "./units.js";
export * from "./threads.js";
