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
