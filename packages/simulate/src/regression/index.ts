export type { TruthCluster, ForcedMeasurement, Detection, RealisationRecord, ValueWithError, Fraction } from "./types.js";
export { separationArcmin, matchDetections } from "./match.js";
export type { MatchPair, MatchResult } from "./match.js";
export { meanWithError, stdWithError, wilsonFraction, median, bootstrap } from "./statistics.js";
export { regressionSummary } from "./summary.js";
export type { RegressionOptions, RegressionSummary, BiasBin } from "./summary.js";
