export type { SkyMap, FlatGeometry } from "./types.js";
export type { Wcs, Projection, RadeSys } from "./wcs/types.js";
export type { Rfft2Plan, SpectrumLayout } from "./fourier/types.js";
