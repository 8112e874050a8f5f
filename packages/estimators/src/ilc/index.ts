export { checkCovariance, constrainedIlcWeights, standardIlcWeights, combinedVariance } from "./weights.js";
export type { CovarianceCheck } from "./weights.js";
export { ilcBiasFraction, effectiveModeCount, apodisationModeFactor } from "./bias.js";
export { cosineEllWindows, parseEllWindows, windowCount, windowValue, windowsOnModes, mergeAtBoundary } from "./windows.js";
export type { EllWindowSet } from "./windows.js";
export { harmonicIlc } from "./harmonic.js";
export type { HarmonicIlcInput, HarmonicIlcResult, IlcDomainReport } from "./harmonic.js";
