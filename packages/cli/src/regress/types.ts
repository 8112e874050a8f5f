/** What one regression realisation leaves behind: the statistics' input and the error checks. */
import type { RealisationRecord } from "@umbra/simulate";

/** Settings that define a regression run (everything but how it was split or scheduled). */
export interface RegressSettings {
  realisations: number;
  firstSeed: number;
  snrMin: number;
  randoms: number;
  profile: string;
  filter: string;
}

/** One realisation's result, JSON-able (written to `realisations/seed-<seed>.json`). */
export interface RealisationResult {
  seed: number;
  /** SHA-256 of the scenario file and the settings: a realisation is reused only when both match. */
  runKey: string;
  record: RealisationRecord;
  randomScatter: readonly { thetaArcmin: number; sigmaAnalytic: number; sigmaRandom: number; count: number }[];
  iterations: number;
}
