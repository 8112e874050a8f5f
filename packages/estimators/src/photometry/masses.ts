/**
 * M500 from the measured Y for every cluster with a redshift: the Y–M relation solved with the
 * aperture (each trial θ500 re-fits the cluster at that size). With a step-wise solver
 * (ClusterPhysics.massFromYSteps) all clusters advance together and each step's re-fits run as one
 * batch on the fit runner (so on several threads when it has them); otherwise each cluster is
 * solved in turn. Both give the same numbers.
 */
import { RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import type { FilterBank } from "../mmf/bank.js";
import type { ProfileTable } from "../mmf/profile.js";
import type { FitRunner } from "../parallel/fitPool.js";
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

/** Masses of `targets` (null entries are skipped and give null). Y(θ) = y0(θ) θ² g(0) from a fit at θ. */
export function massesFromY(
  bank: FilterBank,
  table: ProfileTable,
  targets: readonly (MassTarget | null)[],
  physics: ClusterPhysics,
  runner: FitRunner,
): (MassOutcome | null)[] {
  const caches = targets.map(() => new Map<number, YAt | null>());
  const fitAt = (list: readonly { k: number; theta: number }[]): void => {
    const fits = runner.fitMany(bank, table, list.map(({ k, theta }) => {
      const t = targets[k] as MassTarget;
      return { seds: t.seds, sedKey: t.sedKey, thetaRad: theta * RAD_PER_ARCMIN, px: t.px, py: t.py };
    }));
    list.forEach(({ k, theta }, i) => {
      const f = fits[i];
      const area = theta * theta * table.integralUnitScale;
      caches[k]?.set(theta, f == null ? null : { yArcmin2: (f.amplitudes[0] as number) * area, yErrArcmin2: Math.sqrt(f.covariance[0] as number) * area });
    });
  };
  const out: (MassOutcome | null)[] = targets.map(() => null);
  if (physics.massFromYSteps === undefined) {
    const solveOne = physics.massFromY;
    if (solveOne === undefined) return out;
    targets.forEach((t, k) => {
      if (t === null) return;
      const yAt = (theta: number): YAt => {
        if (!caches[k]!.has(theta)) fitAt([{ k, theta }]);
        const r = caches[k]!.get(theta);
        if (r == null) throw new UmbraError("BAD_DATA", "singular matched-filter fit while solving for the mass");
        return r;
      };
      out[k] = attempt(() => solveOne(yAt, t.z));
    });
    return out;
  }
  const steps = targets.map((t) => (t === null ? null : (physics.massFromYSteps as NonNullable<ClusterPhysics["massFromYSteps"]>)(t.z)));
  // the θ each unfinished solver waits for
  const waiting = new Map<number, number>();
  const advance = (k: number, answer: YAt | undefined): void => {
    const gen = steps[k];
    if (gen == null) return;
    let value = answer;
    for (;;) {
      let r: IteratorResult<number, { m500Msun: number; m500ErrMsun: number }>;
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
      const theta = r.value;
      if (!caches[k]!.has(theta)) {
        waiting.set(k, theta);
        return;
      }
      const cached = caches[k]!.get(theta);
      if (cached == null) {
        out[k] = "failed";
        return;
      }
      value = cached;
    }
  };
  targets.forEach((_, k) => advance(k, undefined));
  while (waiting.size > 0) {
    const round = [...waiting.entries()].map(([k, theta]) => ({ k, theta }));
    waiting.clear();
    fitAt(round);
    for (const { k, theta } of round) {
      const r = caches[k]!.get(theta);
      if (r == null) out[k] = "failed";
      else advance(k, r);
    }
  }
  return out;
}

function attempt(f: () => { m500Msun: number; m500ErrMsun: number }): MassOutcome {
  try {
    const m = f();
    return { m500Msun: m.m500Msun, m500ErrMsun: m.m500ErrMsun };
  } catch (e) {
    if (!(e instanceof UmbraError)) throw e;
    return "failed";
  }
}
