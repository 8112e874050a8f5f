/**
 * Positional matching of detections to true clusters: greedy, highest-S/N detection first, each to
 * the nearest still-unmatched true cluster within a radius (common practice for completeness and
 * purity of SZ catalogues, no single source).
 */
import type { Detection, TruthCluster } from "./types.js";

/** Angular separation in arcmin between two (RA, Dec) positions in degrees (haversine formula; Sinnott 1984, Sky & Telescope 68, 159). */
export function separationArcmin(ra1Deg: number, dec1Deg: number, ra2Deg: number, dec2Deg: number): number {
  const d2r = Math.PI / 180;
  const sdd = Math.sin(((dec2Deg - dec1Deg) * d2r) / 2);
  const sda = Math.sin(((ra2Deg - ra1Deg) * d2r) / 2);
  const a = sdd * sdd + Math.cos(dec1Deg * d2r) * Math.cos(dec2Deg * d2r) * sda * sda;
  return (2 * Math.asin(Math.min(1, Math.sqrt(a)))) / d2r * 60;
}

/** One detection ↔ truth pair with their separation. */
export interface MatchPair {
  detection: number;
  truth: number;
  separationArcmin: number;
}

/** Result of {@link matchDetections}: pairs, and per-item matched flags. */
export interface MatchResult {
  pairs: MatchPair[];
  /** For each detection, the index of its true cluster or −1. */
  truthOfDetection: Int32Array;
  /** For each true cluster, the index of its detection or −1. */
  detectionOfTruth: Int32Array;
}

/**
 * Match `detections` to `truth` within `radiusArcmin`: detections in decreasing S/N (ties by input
 * order) each take the nearest unmatched true cluster inside the radius.
 */
export function matchDetections(detections: readonly Detection[], truth: readonly TruthCluster[], radiusArcmin: number): MatchResult {
  const order = detections.map((_, i) => i).sort((a, b) => detections[b]!.snr - detections[a]!.snr || a - b);
  const truthOfDetection = new Int32Array(detections.length).fill(-1);
  const detectionOfTruth = new Int32Array(truth.length).fill(-1);
  const pairs: MatchPair[] = [];
  for (const i of order) {
    const d = detections[i]!;
    let best = -1;
    let bestSep = radiusArcmin;
    for (let j = 0; j < truth.length; j++) {
      if (detectionOfTruth[j] !== -1) continue;
      const sep = separationArcmin(d.raDeg, d.decDeg, truth[j]!.raDeg, truth[j]!.decDeg);
      if (sep <= bestSep) {
        bestSep = sep;
        best = j;
      }
    }
    if (best >= 0) {
      truthOfDetection[i] = best;
      detectionOfTruth[best] = i;
      pairs.push({ detection: i, truth: best, separationArcmin: bestSep });
    }
  }
  return { pairs, truthOfDetection, detectionOfTruth };
}
