export { flatGeometry, pixelSizeArcmin, pixelSidesDeg, fieldSizeDeg, pixelAreaSr } from "./flat.js";
export { cutout } from "./cutout.js";
export type { Cutout, CutoutOptions } from "./cutout.js";
