/**
 * M500 from the measured Y for every cluster with a redshift: the Y–M relation solved with the
 * aperture (each trial θ500 re-fits the cluster at that size). The clusters' rings (one pass over the
 * Fourier modes per cluster, ../mmf/fit.ts) are computed in chunks as batches on the fit runner (so
 * on several threads when it has them); each trial size then costs one pass over the rings, in this
 * thread. A step-wise solver (ClusterPhysics.massFromYSteps) and a callback solver
 * (ClusterPhysics.massFromY) give the same numbers.
 */
import { RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import type { FilterBank } from "../mmf/bank.js";
import { ellRings } from "../mmf/fit.js";
import type { ProfileTable } from "../mmf/profile.js";
import type { FitRunner } from "../parallel/fitPool.js";
import type { SizeFitter } from "../parallel/fitBatch.js";
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
    const fitters = runner.sizeFitters(bank, table, ks.map((k) => targets[k] as MassTarget));
    ks.forEach((k, i) => {
      out[k] = solveMass(fitters[i] as SizeFitter, table, physics, (targets[k] as MassTarget).z);
    });
  }
  return out;
}

/** One cluster's mass from its size fitter, with the step-wise solver when there is one. */
function solveMass(fit: SizeFitter, table: ProfileTable, physics: ClusterPhysics, z: number): MassOutcome {
  const cache = new Map<number, YAt>();
  const yAt = (theta: number): YAt => {
    let y = cache.get(theta);
    if (y === undefined) {
      const f = fit(theta * RAD_PER_ARCMIN);
      if (f === null) throw new UmbraError("BAD_DATA", "singular matched-filter fit while solving for the mass");
      const area = theta * theta * table.integralUnitScale;
      y = { yArcmin2: (f.amplitudes[0] as number) * area, yErrArcmin2: Math.sqrt(f.covariance[0] as number) * area };
      cache.set(theta, y);
    }
    return y;
  };
  try {
    if (physics.massFromYSteps !== undefined) {
      const gen = physics.massFromYSteps(z);
      let r = gen.next();
      while (r.done !== true) r = gen.next(yAt(r.value));
      return { m500Msun: r.value.m500Msun, m500ErrMsun: r.value.m500ErrMsun };
    }
    const m = (physics.massFromY as NonNullable<ClusterPhysics["massFromY"]>)(yAt, z);
    return { m500Msun: m.m500Msun, m500ErrMsun: m.m500ErrMsun };
  } catch (e) {
    if (!(e instanceof UmbraError)) throw e;
    return "failed";
  }
}
