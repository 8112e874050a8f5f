/**
 * Regression statistics: matching, binomial intervals, pulls, bias, completeness, purity, position
 * errors. Reference numbers: fixtures/simulate/regression_reference.json (made by
 * fixtures/simulate/make_regression_reference.py with astropy 5.2.1 and scipy 1.10.1).
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { createRng } from "@umbra/core";
import {
  matchDetections,
  meanWithError,
  regressionSummary,
  separationArcmin,
  stdWithError,
  wilsonFraction,
  type RealisationRecord,
} from "../src/regression/index.js";

interface Ref {
  separation: { a: [number, number]; b: [number, number]; arcmin: number }[];
  wilson68: { k: number; n: number; lower: number; upper: number }[];
}
const ref = JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/simulate/regression_reference.json", import.meta.url)), "utf8")) as Ref;

describe("matching", () => {
  it("computes angular separations as astropy's SkyCoord.separation (RA wrap and near the pole included)", () => {
    const got = ref.separation.map((s) => separationArcmin(s.a[0], s.a[1], s.b[0], s.b[1]));
    expect(got).toAllClose(ref.separation.map((s) => s.arcmin), { rtol: 1e-9 });
  });
  it("gives the brightest detection first choice and never matches one truth twice", () => {
    const truth = [
      { id: "A", raDeg: 10, decDeg: 0, yArcmin2: 1e-3, snrTrue: 10 },
      { id: "B", raDeg: 10.05, decDeg: 0, yArcmin2: 1e-3, snrTrue: 10 },
    ];
    // both detections are nearest to A; the brighter one (index 1) gets A, the other falls to B (3 arcmin away)
    const dets = [
      { raDeg: 10.01, decDeg: 0, snr: 5 },
      { raDeg: 10.005, decDeg: 0, snr: 9 },
    ];
    const m = matchDetections(dets, truth, 3.5);
    expect(Array.from(m.truthOfDetection)).toEqual([1, 0]);
    expect(Array.from(m.detectionOfTruth)).toEqual([1, 0]);
    expect(matchDetections(dets, truth, 1).pairs.length).toBe(1);
  });
});

describe("basic statistics", () => {
  it("gives the Wilson 68.27 % interval of scipy's binomtest(...).proportion_ci(method='wilson')", () => {
    for (const w of ref.wilson68) {
      const f = wilsonFraction(w.k, w.n);
      expect([f.lower, f.upper]).toAllClose([w.lower, w.upper], { rtol: 1e-9, atol: 1e-12 });
    }
  });
  it("returns NaN and the whole [0, 1] interval for an empty bin", () => {
    const f = wilsonFraction(0, 0);
    expect(Number.isNaN(f.fraction)).toBe(true);
    expect([f.lower, f.upper]).toEqual([0, 1]);
  });
  it("computes mean ± s/√n and std ± s/√(2(n−1)) by hand on a small sample", () => {
    // sample 1,2,3,4: mean 2.5, s = sqrt(5/3); hand computation
    const m = meanWithError([1, 2, 3, 4]);
    const s = stdWithError([1, 2, 3, 4]);
    expect([m.value, m.error]).toAllClose([2.5, Math.sqrt(5 / 3) / 2], { rtol: 1e-14 });
    expect([s.value, s.error]).toAllClose([Math.sqrt(5 / 3), Math.sqrt(5 / 3) / Math.sqrt(6)], { rtol: 1e-14 });
  });
});

/** Invented realisations: unbiased Gaussian measurements with known errors, detections at the truth plus scatter, and spurious detections. */
function fakeRecords(nReal: number, biasFraction: number, errorScale: number): RealisationRecord[] {
  const rng = createRng(99);
  const out: RealisationRecord[] = [];
  for (let r = 0; r < nReal; r++) {
    const truth = [];
    const forced = [];
    const detections = [];
    for (let i = 0; i < 40; i++) {
      const y = 1e-3 * (0.5 + 4 * rng.uniform());
      const err = 2e-4;
      const ra = 30 + 2 * rng.uniform();
      const dec = -5 + 2 * rng.uniform();
      const id = `C${r}-${i}`;
      truth.push({ id, raDeg: ra, decDeg: dec, yArcmin2: y, snrTrue: y / err });
      const meas = y * (1 + biasFraction) + err * errorScale * rng.normal();
      forced.push({ id, yArcmin2: meas, yErrArcmin2: err });
      const snr = meas / err;
      if (snr > 3) detections.push({ raDeg: ra + (0.3 / 60) * rng.normal(), decDeg: dec + (0.3 / 60) * rng.normal(), snr });
    }
    for (let k = 0; k < 3; k++) detections.push({ raDeg: 35 + rng.uniform(), decDeg: 5, snr: 3 + 2 * rng.uniform() });
    out.push({ seed: r, truth, forced, detections });
  }
  return out;
}

describe("regression summary", () => {
  it("finds pulls of mean 0 and width 1 for unbiased measurements with correct errors", () => {
    const s = regressionSummary(fakeRecords(20, 0, 1));
    expect(s.pulls.n).toBe(800);
    expect(Math.abs(s.pulls.mean.value)).toBeLessThan(3 * s.pulls.mean.error);
    expect(Math.abs(s.pulls.std.value - 1)).toBeLessThan(3 * s.pulls.std.error);
  });
  it("detects a 10 % Y bias and under-estimated errors", () => {
    const s = regressionSummary(fakeRecords(20, 0.1, 1.5));
    const hi = s.yBias.filter((b) => b.snrLo >= 10 && b.n > 20);
    expect(hi.length).toBeGreaterThan(0);
    for (const b of hi) expect(Math.abs(b.fractionalBias.value - 0.1)).toBeLessThan(4 * b.fractionalBias.error + 0.005);
    expect(Math.abs(s.pulls.std.value - 1.5)).toBeLessThan(4 * s.pulls.std.error + 0.1);
  });
  it("reports completeness near 1 at high true S/N and purity below 1 when spurious detections exist", () => {
    const s = regressionSummary(fakeRecords(10, 0, 1));
    const top = s.completeness.find((c) => c.snrLo === 10)!;
    expect(top.fraction).toBeGreaterThan(0.95);
    const p3 = s.purity.find((p) => p.threshold === 3)!;
    expect(p3.fraction).toBeLessThan(1);
    expect(p3.n - p3.k).toBeGreaterThanOrEqual(30); // 3 spurious per realisation at S/N ≥ 3
    expect(s.position.medianArcmin.value).toBeGreaterThan(0.1);
    expect(s.position.medianArcmin.value).toBeLessThan(1);
    expect(s.position.medianArcmin.error).toBeGreaterThan(0);
  });
  it("is a pure function: the same records and options give identical JSON", () => {
    const a = JSON.stringify(regressionSummary(fakeRecords(5, 0, 1)));
    const b = JSON.stringify(regressionSummary(fakeRecords(5, 0, 1)));
    expect(a).toBe(b);
  });
});
