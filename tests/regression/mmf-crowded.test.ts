/**
 * A crowded field of bright clusters (36 invented clusters in 18 deg², true S/N up to ~60): the
 * errors stay calibrated only when the clusters are removed from the covariance estimate
 * (Zubeldia, Chluba & Battye 2023, MNRAS 522, 5123: a covariance measured on maps that still hold
 * the clusters overestimates the noise). Fixed seeds; pulls over two skies.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { parseScenario, simulateField } from "../../packages/simulate/src/index.js";
import { stackFromSimulatedField } from "../../packages/cli/src/commands/regress.js";
import { a10ProfileShape, measureClusters, stackSedProvider, type MeasureResult } from "../../packages/estimators/src/index.js";

function scenario(): unknown {
  const list = [];
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 6; j++) {
      const k = i * 6 + j;
      list.push({
        id: `CROWD-${String(k).padStart(2, "0")}`,
        raDeg: 52.5 + ((i - 2.5) * 0.62 + 0.07 * Math.sin(k)) / Math.cos((27.5 * Math.PI) / 180),
        decDeg: -27.5 + (j - 2.5) * 0.62 + 0.07 * Math.cos(3 * k),
        m500Msun: 1.6e14 * (1 + (k % 5)),
        z: 0.15 + 0.1 * (k % 6),
      });
    }
  }
  return {
    name: "crowded-bright",
    description: "Invented crowded field: 36 bright clusters on a jittered grid.",
    cosmology: "cmb2018",
    field: { nx: 512, ny: 512, pixelArcmin: 0.5, projection: "TAN", centerDeg: [52.5, -27.5], fieldId: "HERON-CROWD-04" },
    bands: [
      { name: "f095", frequencyGHz: 95, beamFwhmArcmin: 2.1, unit: "uK_CMB", noiseUKArcmin: 10 },
      { name: "f150", frequencyGHz: 150, beamFwhmArcmin: 1.4, unit: "uK_CMB", noiseUKArcmin: 8 },
      { name: "f220", frequencyGHz: 220, beamFwhmArcmin: 1.0, unit: "uK_CMB", noiseUKArcmin: 25 },
    ],
    sky: { cmb: { spectrum: "lcdm2018" }, clusters: { list, scatterLnY: 0, relativistic: false } },
  };
}

describe("crowded field of bright clusters", () => {
  const cleaned: { pull: number; snr: number; err: number }[] = [];
  const raw: { pull: number; err: number }[] = [];

  beforeAll(() => {
    const sc = parseScenario(scenario(), "crowded-bright");
    for (const seed of [41, 42]) {
      const field = simulateField(sc, seed);
      const stack = stackFromSimulatedField(field);
      const truth = field.clusters.filter((c) => c.inField && !c.nearEdge);
      const cat = truth.map((c) => ({ id: c.id, raDeg: c.raDeg, decDeg: c.decDeg, theta500Arcmin: c.theta500Arcmin }));
      const opts = { profile: a10ProfileShape(), seds: stackSedProvider(stack), relativistic: false, randomCount: 0 };
      const a: MeasureResult = measureClusters(stack, cat, opts);
      const b: MeasureResult = measureClusters(stack, cat, { ...opts, maxIterations: 0 });
      truth.forEach((t, k) => {
        const ma = a.clusters[k]!;
        const mb = b.clusters[k]!;
        if (!Number.isFinite(ma.yArcmin2) || ma.flags.length > 0) return;
        cleaned.push({ pull: (ma.yArcmin2 - t.y5r500Arcmin2) / ma.yErrArcmin2, snr: t.y5r500Arcmin2 / ma.yErrArcmin2, err: ma.yErrArcmin2 });
        raw.push({ pull: (mb.yArcmin2 - t.y5r500Arcmin2) / mb.yErrArcmin2, err: mb.yErrArcmin2 });
      });
    }
  }, 240_000);

  it("holds tens of clusters with true S/N up to tens", () => {
    expect(cleaned.length).toBeGreaterThanOrEqual(50);
    expect(Math.max(...cleaned.map((c) => c.snr))).toBeGreaterThan(30);
  });

  it("keeps the pulls of unit width with the cluster-cleaned covariance", () => {
    const p = cleaned.map((c) => c.pull);
    const mean = p.reduce((s, x) => s + x, 0) / p.length;
    const sd = Math.sqrt(p.reduce((s, x) => s + (x - mean) ** 2, 0) / (p.length - 1));
    console.log("crowded: n", p.length, "pull mean", mean.toFixed(3), "sd", sd.toFixed(3), "max snr", Math.max(...cleaned.map((c) => c.snr)).toFixed(1));
    // ~60 clusters: the sample sd has a ~9 % standard error
    expect(sd).toBeGreaterThan(0.8);
    expect(sd).toBeLessThan(1.2);
    expect(Math.abs(mean)).toBeLessThan(0.35);
  });

  it("overestimates the errors when the clusters stay in the covariance", () => {
    const ratio = raw.reduce((s, r, k) => s + r.err / cleaned[k]!.err, 0) / raw.length;
    const p = raw.map((r) => r.pull);
    const mean = p.reduce((s, x) => s + x, 0) / p.length;
    const sd = Math.sqrt(p.reduce((s, x) => s + (x - mean) ** 2, 0) / (p.length - 1));
    console.log("uncleaned: error ratio", ratio.toFixed(3), "pull sd", sd.toFixed(3));
    expect(ratio).toBeGreaterThan(1.05);
  });
});
