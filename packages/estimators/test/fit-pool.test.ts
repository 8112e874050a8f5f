/**
 * Matched-filter fits on worker threads (src/parallel/): a batch gives bit-identical results on one
 * or several threads, in request order, with null for a singular fit; measure and search give the
 * same results with a pool as without (invented field).
 */
import { afterAll, describe, expect, it } from "vitest";
import { pixelToWorld } from "@umbra/maps";
import { measureClusters } from "../src/photometry/measure.js";
import { searchClusters } from "../src/search/blind.js";
import { gaussianShape } from "../src/mmf/profile.js";
import { createFitPool, serialFits } from "../src/parallel/fitPool.js";
import { mergeSizeSlots, sizeArrays } from "../src/parallel/sizeBatch.js";
import type { CatalogueCluster, SedProvider } from "../src/photometry/types.js";
import { BANDS3, makeField, tszNonRel, type FieldCluster } from "./photometry-helpers.js";

const sed = Float64Array.from(BANDS3.map((b) => tszNonRel(b.frequencyGHz)));
const seds: SedProvider = { tsz: () => sed, ksz: () => Float64Array.from(BANDS3.map(() => -2.7255)) };
const pool = createFitPool(2);
// the same with this thread taking no tasks, so that the worker thread is sure to compute
const workersOnly = createFitPool(2, { callerTakesTasks: false });
afterAll(async () => {
  await pool.close();
  await workersOnly.close();
});

describe("fit pool", () => {
  const truth: FieldCluster[] = [];
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) truth.push({ id: `P${i}${j}`, px: 30.3 + 35 * i, py: 29.6 + 35 * j, sigmaArcmin: 1.2, y0: 3e-4 });
  const stack = makeField(128, 0.5, BANDS3, truth, 31);
  const cat: CatalogueCluster[] = truth.map((c, k) => {
    const w = pixelToWorld(stack.wcs!, c.px, c.py);
    // the first cluster has no size: it is scanned; z and a toy mass solver exercise the mass stage
    return { id: c.id, raDeg: w.lonDeg, decDeg: w.latDeg, theta500Arcmin: k === 0 ? null : c.sigmaArcmin, z: 0.3 };
  });
  const physics = {
    angularDiameterDistanceMpc: () => 1000,
    // a toy Y–M relation Y = 1e-3 (θ/2′)^1.5 arcmin², solved by bisection in θ through the measured Y(θ)
    *massFromYSteps() {
      let lo = 0.3;
      let hi = 8;
      for (let it = 0; it < 12; it++) {
        const mid = Math.sqrt(lo * hi);
        const y: { yArcmin2: number; yErrArcmin2: number } = yield mid;
        if (y.yArcmin2 > 1e-3 * (mid / 2) ** 1.5) lo = mid;
        else hi = mid;
      }
      return { m500Msun: 1e14 * Math.sqrt(lo * hi), m500ErrMsun: 1e13 };
    },
  };
  const opts = { profile: gaussianShape(1), seds, randomCount: 0, maxIterations: 2, scanSizesArcmin: [0.8, 1.2, 1.8], physics };

  it("gives measure results identical to one thread, masses included", async () => {
    const one = measureClusters(stack, cat, opts);
    const two = measureClusters(stack, cat, { ...opts, fitRunner: pool });
    expect(measureClusters(stack, cat, { ...opts, fitRunner: workersOnly }).clusters).toEqual(one.clusters);
    expect(workersOnly.workerTasks).toBeGreaterThan(0);
    expect(two.clusters).toEqual(one.clusters);
    expect(one.clusters.every((c) => c.m500Msun > 0)).toBe(true);
    expect(one.clusters[0]!.scan!.length).toBe(3);
    // the same solver given as a callback (each cluster solved in turn) gives the same masses
    const callback = {
      angularDiameterDistanceMpc: physics.angularDiameterDistanceMpc,
      massFromY(yAt: (theta: number) => { yArcmin2: number; yErrArcmin2: number }, z: number) {
        const gen = physics.massFromYSteps();
        let r = gen.next();
        while (r.done !== true) r = gen.next(yAt(r.value));
        void z;
        return r.value;
      },
    };
    const alone = measureClusters(stack, cat, { ...opts, physics: callback });
    expect(alone.clusters.map((c) => [c.m500Msun, c.m500ErrMsun])).toEqual(one.clusters.map((c) => [c.m500Msun, c.m500ErrMsun]));
  }, 60_000);

  it("gives search results identical to one thread, with and without depth (ivar) maps", () => {
    const sopts = { profile: gaussianShape(1), tszSed: sed, sizesArcmin: [0.8, 1.2, 1.8, 2.5], maxIterations: 1, snrMin: 5 };
    const one = searchClusters(stack, sopts);
    expect(one.candidates.length).toBeGreaterThan(5);
    const two = searchClusters(stack, { ...sopts, fitRunner: pool });
    expect(two.candidates).toEqual(one.candidates);
    expect(two.diagnostics).toEqual(one.diagnostics);
    const before = workersOnly.workerTasks;
    expect(searchClusters(stack, { ...sopts, fitRunner: workersOnly })).toEqual(one);
    // every filter size of the two passes and at least the last pass's re-fits of the reported
    // candidates at every size ran in the worker thread
    const n = sopts.sizesArcmin.length;
    expect(workersOnly.workerTasks - before).toBeGreaterThanOrEqual(2 * n + one.candidates.length * n);
    // depth rising across the field (ivar in 1/K², invented): the local-noise path of the size loop
    const deep = { ...stack, bands: stack.bands.map((b) => ({ ...b, ivar: Float64Array.from({ length: 128 * 128 }, (_, p) => 1e10 * (1 + (p % 128) / 64)) })) };
    const oneDeep = searchClusters(deep, sopts);
    expect(searchClusters(deep, { ...sopts, fitRunner: pool })).toEqual(oneDeep);
    expect(oneDeep.candidates).not.toEqual(one.candidates);
  }, 60_000);

  it("merges per-thread maxima over sizes into the one-thread result, ties to the smaller size", () => {
    // two "threads" run in turn on shared counters: slot 1 takes the first two sizes, slot 0 the rest
    const npix = 6;
    const maps = [[1, 5, 2, 7, 0, 3], [4, 5, 1, 7, 0, 2], [4, 6, 3, 1, 0, 9], [0, 6, 8, 1, 0, 9]];
    const fold = (slots: number, order: number[][]) => {
      const a = sizeArrays(maps.length, npix, slots, false);
      for (const [slot, ...ks] of order) {
        for (const k of ks) {
          for (let p = 0; p < npix; p++) {
            if (maps[k]![p]! > a.best[slot!]![p]!) {
              a.best[slot!]![p] = maps[k]![p]!;
              a.arg[slot!]![p] = k;
            }
          }
        }
      }
      return mergeSizeSlots(a);
    };
    const one = fold(1, [[0, 0, 1, 2, 3]]);
    expect(Array.from(one.best)).toEqual([4, 6, 8, 7, 0, 9]);
    expect(Array.from(one.arg)).toEqual([1, 2, 3, 0, 0, 2]);
    const two = fold(2, [[1, 0, 1], [0, 2, 3]]);
    expect(two).toEqual(one);
  });

  it("returns null for a singular fit (a deprojected tSZ) in request order", async () => {
    const { prepareStack } = await import("../src/photometry/prepare.js");
    const { buildFilterBank } = await import("../src/mmf/bank.js");
    const { tabulateProfile } = await import("../src/mmf/profile.js");
    const { deconvolveBeams, estimateBandCovariance } = await import("../src/noise/estimate.js");
    const prep = prepareStack(stack);
    const beams = stack.bands.map((b) => b.beam);
    const cov = estimateBandCovariance(deconvolveBeams(prep.spectra, beams, prep.ells), prep.plan.layout, stack.geometry, prep.ells, { windowMeanSquare: prep.windowMeanSquare, beams });
    const bank = buildFilterBank({ layout: prep.plan.layout, geometry: stack.geometry, ells: prep.ells, spectra: prep.spectra, beams, covariance: cov, deproject: [sed] });
    const table = tabulateProfile(gaussianShape(1), 40000 * 4e-3);
    const reqs = [0.5e-3, 1e-3].map((t) => ({ seds: [sed], sedKey: "tsz", thetaRad: t, px: 60, py: 60 }));
    expect(pool.fitMany(bank, table, reqs)).toEqual([null, null]);
    expect(serialFits.fitMany(bank, table, reqs)).toEqual([null, null]);
  });
});
