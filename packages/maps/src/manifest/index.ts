export { loadBandManifest, validateManifest } from "./load.js";
export type { LoadedManifest } from "./load.js";
export { writeBandManifest } from "./write.js";
export { writeTextAtomic } from "./atomic.js";
export type { BandManifest, BandSpec } from "./schema.js";
