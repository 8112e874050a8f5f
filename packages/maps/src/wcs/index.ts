export { wcsFromHeader } from "./header.js";
export type { HeaderLike } from "./header.js";
export {
  pixelToWorld,
  worldToPixel,
  pixelToWorldArray,
  worldToPixelArray,
  planWcs,
  pixelToWorldPlanned,
  worldToPixelPlanned,
} from "./transform.js";
export type { WcsPlan, WorldDeg, PixelPos } from "./transform.js";
export { wcsToHeaderCards, shiftWcs } from "./cards.js";
export { makeWcs } from "./make.js";
export type { MakeWcsOptions } from "./make.js";
export type { WcsCard } from "./cards.js";
export {
  frameRotation,
  rotateLonLat,
  icrsToGalacticDeg,
  galacticToIcrsDeg,
  convertibleFrame,
  frameOf,
  multiply3,
  transpose3,
  ICRS_TO_FK5_J2000,
  FK5_J2000_TO_GALACTIC,
  ICRS_TO_GALACTIC,
  GALACTIC_POLE_FK5_J2000,
} from "./frames.js";
export type { Matrix3, ConvertibleFrame, FrameSpec } from "./frames.js";
