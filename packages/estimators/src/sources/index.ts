export { inpaintHarmonic } from "./inpaint.js";
export type { InpaintOptions } from "./inpaint.js";
export { detectPointSources } from "./detect.js";
export type { PointSource } from "./detect.js";
