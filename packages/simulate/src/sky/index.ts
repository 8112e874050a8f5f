export { simulateField, scenarioBandSpec } from "./simulate.js";
export type { SimulatedField, SimulatedBand, SimulateOptions } from "./simulate.js";
export { drawClusters, scenarioHaloGrid } from "./clusterTruth.js";
export type { TrueCluster, ClusterDraw } from "./clusterTruth.js";
export { drawRadioSources, drawFluxJy } from "./radio.js";
export type { TrueRadioSource } from "./radio.js";
export { fieldWcs, fieldGeometry } from "./field.js";
export { relativeDepth } from "./depth.js";
