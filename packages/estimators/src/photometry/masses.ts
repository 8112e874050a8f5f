/**
 * M500 from the measured Y for every cluster with a redshift: the Y–M relation solved with the
 * aperture (each trial θ500 re-fits the cluster at that size). The clusters' rings (one pass over the
 * Fourier modes per cluster, ../mmf/fit.ts) are computed in chunks as batches on the fit runner, after
 * which each trial size costs one pass over the rings. With a step-wise solver
 * (ClusterPhysics.massFromYSteps) the clusters of a chunk advance together and each step's fits run
 * as one batch on the runner's threads; a callback solver (ClusterPhysics.massFromY) solves each
 * cluster in turn in this thread. Both give the same numbers.
 */
import { RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import type { FilterBank } from "../mmf/bank.js";
import { ellRings } from "../mmf/fit.js";
import type { ProfileTable } from "../mmf/profile.js";
import type { FitRunner } from "../parallel/fitPool.js";
import type { RingSet } from "../parallel/fitBatch.js";
import type { ClusterPhysics } from "./types.js";

/** A cluster whose mass is wanted: its SEDs, position and redshift. */
export interface MassTarget {
  readonly seds: readonly Float64Array[];
  readonly sedKey: string;
  readonly px: number;
  readonly py: number;
  readonly z: number;
}

/** M500 and its 1σ error (M☉), or "failed" (no solution, or a singular re-fit). */
export type MassOutcome = { readonly m500Msun: number; readonly m500ErrMsun: number } | "failed";

type YAt = { yArcmin2: number; yErrArcmin2: number };
type Solution = { m500Msun: number; m500ErrMsun: number };

/** Memory for the rings of one chunk of clusters (bytes): 256 MiB holds ~85 clusters' rings on a 2048² map. */
const RING_CHUNK_BYTES = 256 * 2 ** 20;

/** Masses of `targets` (null entries are skipped and give null). Y(θ) = y0(θ) θ² g(0) from a fit at θ. */
export function massesFromY(
  bank: FilterBank,
  table: ProfileTable,
  targets: readonly (MassTarget | null)[],
  physics: ClusterPhysics,
  runner: FitRunner,
): (MassOutcome | null)[] {
  const out: (MassOutcome | null)[] = targets.map(() => null);
  if (physics.massFromYSteps === undefined && physics.massFromY === undefined) return out;
  const live = targets.flatMap((t, k) => (t === null ? [] : [k]));
  const perCluster = 8 * ellRings(bank).ell.length * Math.max(1, ...live.map((k) => (targets[k] as MassTarget).seds.length));
  const chunk = Math.max(1, Math.floor(RING_CHUNK_BYTES / perCluster));
  for (let c0 = 0; c0 < live.length; c0 += chunk) {
    const ks = live.slice(c0, c0 + chunk);
    const rings = runner.ringSet(bank, table, ks.map((k) => targets[k] as MassTarget));
    const solved = physics.massFromYSteps !== undefined ? solveInStep(rings, table, physics, ks.map((k) => (targets[k] as MassTarget).z)) : ks.map((k, i) => solveAlone(rings, i, table, physics, (targets[k] as MassTarget).z));
    ks.forEach((k, i) => {
      out[k] = solved[i] as MassOutcome;
    });
  }
  return out;
}

/** Y and its error (arcmin²) at θ500 (arcmin) from a fit at that size. */
function yFromFit(amplitude: number, variance: number, theta: number, table: ProfileTable): YAt {
  const area = theta * theta * table.integralUnitScale;
  return { yArcmin2: amplitude * area, yErrArcmin2: Math.sqrt(variance) * area };
}

/** Every cluster of `rings` solved with the step-wise solver, all advancing together: each step's fits are one batch. */
function solveInStep(rings: RingSet, table: ProfileTable, physics: ClusterPhysics, zs: readonly number[]): MassOutcome[] {
  const stepper = physics.massFromYSteps as NonNullable<ClusterPhysics["massFromYSteps"]>;
  const out: (MassOutcome | null)[] = zs.map(() => null);
  const caches = zs.map(() => new Map<number, YAt | null>());
  const gens = zs.map((z) => stepper(z));
  // the θ each unfinished solver waits for
  const waiting = new Map<number, number>();
  const advance = (k: number, answer: YAt | undefined): void => {
    const gen = gens[k] as Generator<number, Solution, YAt>;
    let value = answer;
    for (;;) {
      let r: IteratorResult<number, Solution>;
      try {
        r = value === undefined ? gen.next() : gen.next(value);
      } catch (e) {
        if (!(e instanceof UmbraError)) throw e;
        out[k] = "failed";
        return;
      }
      if (r.done === true) {
        out[k] = { m500Msun: r.value.m500Msun, m500ErrMsun: r.value.m500ErrMsun };
        return;
      }
      const cached = caches[k]!.get(r.value);
      if (cached === undefined) {
        waiting.set(k, r.value);
        return;
      }
      if (cached === null) {
        out[k] = "failed";
        return;
      }
      value = cached;
    }
  };
  zs.forEach((_, k) => advance(k, undefined));
  while (waiting.size > 0) {
    const round = [...waiting.entries()];
    waiting.clear();
    const fits = rings.fitMany(round.map(([k, theta]) => ({ index: k, thetaRad: theta * RAD_PER_ARCMIN })));
    round.forEach(([k, theta], i) => {
      const f = fits[i];
      const y = f == null ? null : yFromFit(f.amplitudes[0] as number, f.covariance[0] as number, theta, table);
      caches[k]!.set(theta, y);
      if (y === null) out[k] = "failed";
      else advance(k, y);
    });
  }
  return out as MassOutcome[];
}

/** Cluster `index` of `rings` solved with the callback solver, in this thread. */
function solveAlone(rings: RingSet, index: number, table: ProfileTable, physics: ClusterPhysics, z: number): MassOutcome {
  const cache = new Map<number, YAt>();
  const yAt = (theta: number): YAt => {
    let y = cache.get(theta);
    if (y === undefined) {
      const f = rings.fit(index, theta * RAD_PER_ARCMIN);
      if (f === null) throw new UmbraError("BAD_DATA", "singular matched-filter fit while solving for the mass");
      y = yFromFit(f.amplitudes[0] as number, f.covariance[0] as number, theta, table);
      cache.set(theta, y);
    }
    return y;
  };
  try {
    const m = (physics.massFromY as NonNullable<ClusterPhysics["massFromY"]>)(yAt, z);
    return { m500Msun: m.m500Msun, m500ErrMsun: m.m500ErrMsun };
  } catch (e) {
    if (!(e instanceof UmbraError)) throw e;
    return "failed";
  }
}
