/**
 * The regression summary over many simulated realisations: Y bias against true S/N, the pull
 * distribution, completeness against true S/N, purity against the detection threshold and the
 * position error, each with its statistical error. Pure: the same records and options give the same
 * JSON-able object (bootstrap draws come from a generator seeded by the options).
 */
import { createRng } from "@umbra/core";
import { matchDetections } from "./match.js";
import { bootstrap, meanWithError, median, stdWithError, wilsonFraction } from "./statistics.js";
import type { Fraction, RealisationRecord, ValueWithError } from "./types.js";

/** Options of {@link regressionSummary}. */
export interface RegressionOptions {
  /** Edges of the true-S/N bins (default 0, 2, 3, 4, 5, 7, 10, 20, 1e9). */
  snrBinEdges?: readonly number[];
  /** Detection thresholds for purity (default 3, 4, 4.5, 5, 6, 7). */
  thresholds?: readonly number[];
  /** Matching radius in arcmin (default 2). */
  matchRadiusArcmin?: number;
  /** Detection S/N threshold that counts a true cluster as found, for completeness (default 4.5). */
  completenessThreshold?: number;
  /** Seed of the bootstrap generator (default 1). */
  bootstrapSeed?: number;
  /** Bootstrap resamples (default 200). */
  bootstrapResamples?: number;
}

/** One true-S/N bin of the Y bias. */
export interface BiasBin {
  snrLo: number;
  snrHi: number;
  n: number;
  /** Mean of Y_measured − Y_true in arcmin². */
  meanDeltaYArcmin2: ValueWithError;
  /** Σ(Y_measured − Y_true)/ΣY_true: the fractional bias. */
  fractionalBias: ValueWithError;
  /** Mean pull in the bin. */
  meanPull: ValueWithError;
}

/** The JSON-able regression summary. */
export interface RegressionSummary {
  realisations: number;
  seeds: number[];
  options: Required<RegressionOptions>;
  clustersTotal: number;
  detectionsTotal: number;
  yBias: BiasBin[];
  pulls: { n: number; mean: ValueWithError; std: ValueWithError };
  completeness: ({ snrLo: number; snrHi: number } & Fraction)[];
  purity: ({ threshold: number } & Fraction)[];
  position: { n: number; medianArcmin: ValueWithError; rmsArcmin: ValueWithError };
}

const DEFAULTS: Required<RegressionOptions> = {
  snrBinEdges: [0, 2, 3, 4, 5, 7, 10, 20, 1e9],
  thresholds: [3, 4, 4.5, 5, 6, 7],
  matchRadiusArcmin: 2,
  completenessThreshold: 4.5,
  bootstrapSeed: 1,
  bootstrapResamples: 200,
};

function binOf(edges: readonly number[], x: number): number {
  for (let i = 0; i < edges.length - 1; i++) if (x >= edges[i]! && x < edges[i + 1]!) return i;
  return -1;
}

/**
 * Summarise realisations (see module comment). Forced measurements join the truth by id; blind
 * detections match positionally ({@link matchDetections}). Fractional bias error: standard error of
 * the mean difference over the mean true Y (true Y held fixed).
 */
export function regressionSummary(records: readonly RealisationRecord[], options: RegressionOptions = {}): RegressionSummary {
  const o: Required<RegressionOptions> = { ...DEFAULTS, ...options };
  const edges = o.snrBinEdges;
  const nb = edges.length - 1;
  const delta: number[][] = Array.from({ length: nb }, () => []);
  const ytrue: number[][] = Array.from({ length: nb }, () => []);
  const pullsBin: number[][] = Array.from({ length: nb }, () => []);
  const pulls: number[] = [];
  const compK = new Array<number>(nb).fill(0);
  const compN = new Array<number>(nb).fill(0);
  const purK = new Array<number>(o.thresholds.length).fill(0);
  const purN = new Array<number>(o.thresholds.length).fill(0);
  const seps: number[] = [];
  let clustersTotal = 0;
  let detectionsTotal = 0;
  for (const rec of records) {
    clustersTotal += rec.truth.length;
    detectionsTotal += rec.detections.length;
    const byId = new Map(rec.forced.map((f) => [f.id, f]));
    for (const t of rec.truth) {
      const f = byId.get(t.id);
      const b = binOf(edges, t.snrTrue);
      if (f === undefined || b < 0 || !(f.yErrArcmin2 > 0) || !Number.isFinite(f.yArcmin2)) continue;
      delta[b]!.push(f.yArcmin2 - t.yArcmin2);
      ytrue[b]!.push(t.yArcmin2);
      const p = (f.yArcmin2 - t.yArcmin2) / f.yErrArcmin2;
      pullsBin[b]!.push(p);
      pulls.push(p);
    }
    const m = matchDetections(rec.detections, rec.truth, o.matchRadiusArcmin);
    rec.truth.forEach((t, j) => {
      const b = binOf(edges, t.snrTrue);
      if (b < 0) return;
      compN[b]! += 1;
      const d = m.detectionOfTruth[j]!;
      if (d >= 0 && rec.detections[d]!.snr >= o.completenessThreshold) compK[b]! += 1;
    });
    rec.detections.forEach((d, i) => {
      o.thresholds.forEach((q, k) => {
        if (d.snr < q) return;
        purN[k]! += 1;
        if (m.truthOfDetection[i]! >= 0) purK[k]! += 1;
      });
    });
    for (const p of m.pairs) if (rec.detections[p.detection]!.snr >= o.completenessThreshold) seps.push(p.separationArcmin);
  }
  const yBias: BiasBin[] = [];
  for (let b = 0; b < nb; b++) {
    const md = meanWithError(delta[b]!);
    const my = meanWithError(ytrue[b]!).value;
    yBias.push({
      snrLo: edges[b]!,
      snrHi: edges[b + 1]!,
      n: delta[b]!.length,
      meanDeltaYArcmin2: md,
      fractionalBias: { value: md.value / my, error: md.error / my },
      meanPull: meanWithError(pullsBin[b]!),
    });
  }
  const rng = createRng(o.bootstrapSeed);
  const rms = (s: Float64Array): number => Math.sqrt(s.reduce((a, x) => a + x * x, 0) / s.length);
  return {
    realisations: records.length,
    seeds: records.map((r) => r.seed),
    options: o,
    clustersTotal,
    detectionsTotal,
    yBias,
    pulls: { n: pulls.length, mean: meanWithError(pulls), std: stdWithError(pulls) },
    completeness: compK.map((k, b) => ({ snrLo: edges[b]!, snrHi: edges[b + 1]!, ...wilsonFraction(k, compN[b]!) })),
    purity: purK.map((k, i) => ({ threshold: o.thresholds[i]!, ...wilsonFraction(k, purN[i]!) })),
    position: {
      n: seps.length,
      medianArcmin: bootstrap(seps, median, rng.fork("median"), o.bootstrapResamples),
      rmsArcmin: bootstrap(seps, rms, rng.fork("rms"), o.bootstrapResamples),
    },
  };
}
