export { reproject, sameGrid } from "./reproject.js";
export type { TargetGrid, ReprojectOptions } from "./reproject.js";
export { keysKernel, sampleBicubic, sampleBilinear } from "./interpolate.js";
export type { InterpolationMethod } from "./interpolate.js";
export { planPixelMapping, targetToSourcePixel } from "./mapping.js";
export type { PixelMapping } from "./mapping.js";
