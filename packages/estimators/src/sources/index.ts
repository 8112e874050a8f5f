export { inpaintHarmonic } from "./inpaint.js";
export type { InpaintOptions } from "./inpaint.js";
