export { createCosmology, requireRedshift } from "./create.js";
export { cosmologyPreset, COSMOLOGY_PRESETS, COSMOLOGY_PRESET_NAMES } from "./presets.js";
export type { CosmologyPresetName } from "./presets.js";
export type { Cosmology, CosmologyParams } from "./types.js";
export { m500ToR500Mpc, r500ToM500Msun, theta500Rad, theta500Arcmin, theta500ToM500Msun, mpc2ToArcmin2, arcmin2ToMpc2, requireMass } from "./overdensity.js";
