export type { BandCovariance } from "./types.js";
export { estimateBandCovariance, adaptiveBinEdges } from "./estimate.js";
export type { CovarianceOptions } from "./estimate.js";
