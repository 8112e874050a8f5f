/**
 * The records regression statistics work on. Positions in degrees (RA, Dec); Y in arcmin²
 * (Y5R500); signal-to-noise ratios dimensionless.
 */

/** A true cluster of one simulated realisation. */
export interface TruthCluster {
  id: string;
  raDeg: number;
  decDeg: number;
  /** True Y5R500 in arcmin². */
  yArcmin2: number;
  /** True S/N: true Y over the measurement's expected error (from forced photometry). */
  snrTrue: number;
}

/** A forced-photometry measurement at a true cluster (joined by id). */
export interface ForcedMeasurement {
  id: string;
  yArcmin2: number;
  yErrArcmin2: number;
}

/** A blind-search detection. */
export interface Detection {
  raDeg: number;
  decDeg: number;
  snr: number;
}

/** One realisation's inputs to the statistics. */
export interface RealisationRecord {
  seed: number;
  truth: TruthCluster[];
  forced: ForcedMeasurement[];
  detections: Detection[];
}

/** A value with its 1σ statistical error. */
export interface ValueWithError {
  value: number;
  error: number;
}

/** A fraction with its binomial 68.27 % Wilson interval. */
export interface Fraction {
  k: number;
  n: number;
  fraction: number;
  lower: number;
  upper: number;
}
