export { searchClusters, DEFAULT_SEARCH_SIZES_ARCMIN } from "./blind.js";
export type { SearchOptions, Candidate, SearchResult } from "./blind.js";
export { findPeaks, deblendPeaks } from "./peaks.js";
export type { Peak } from "./peaks.js";
export { debiasedSnr } from "./debias.js";
