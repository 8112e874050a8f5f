export type { BandCovariance } from "./types.js";
export { estimateBandCovariance, adaptiveBinEdges, deconvolveBeams, MIN_BEAM_TRANSFER, BLIND_NOISE } from "./estimate.js";
export type { CovarianceOptions } from "./estimate.js";
