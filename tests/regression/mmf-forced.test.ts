/**
 * Regression of the matched multi-frequency filter on simulated skies (fixed seeds): forced
 * photometry at the true positions and sizes, and the blind search, on the invented
 * deep-small-field scenario (CMB, dust/CIB, correlated atmospheric + white noise, A10 clusters
 * from the mass function). Floors from the project's issue: median fractional Y bias within ±3 %
 * for S/N > 10, std of pulls in [0.9, 1.1] over ≥ 100 clusters, analytic error within 10 % of the
 * random-position scatter, completeness ≥ 90 % at true S/N ≥ 6.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { loadScenario, regressionSummary, simulateField, type RealisationRecord, type RegressionSummary } from "../../packages/simulate/src/index.js";
import { runRealisation, type RealisationRun } from "../../packages/cli/src/commands/regress.js";

const SEEDS = [101, 102, 103, 104, 105, 106, 107, 108];

describe("MMF on the deep-small-field scenario (8 fixed seeds)", () => {
  const runs: RealisationRun[] = [];
  let summary: RegressionSummary;
  const fracBiasHighSnr: number[] = [];

  beforeAll(async () => {
    const sc = await loadScenario("fixtures/scenarios/deep-small-field.json");
    for (const seed of SEEDS) {
      const field = simulateField(sc.scenario, seed, sc.cmbTable === undefined ? {} : { cmbTable: sc.cmbTable });
      runs.push(runRealisation(field, { snrMin: 4, randomCount: 400, searchSizesArcmin: [0.5, 0.8, 1.2, 1.8, 2.7, 4, 6, 9] }));
    }
    const records: RealisationRecord[] = runs.map((r) => r.record);
    summary = regressionSummary(records);
    for (const r of runs) {
      const byId = new Map(r.forced.clusters.map((c) => [c.id, c]));
      for (const t of r.record.truth) {
        const m = byId.get(t.id)!;
        if (t.snrTrue > 10) fracBiasHighSnr.push((m.yArcmin2 - t.yArcmin2) / t.yArcmin2);
      }
    }
  }, 240_000);

  it("has pulls of unit width over at least 100 clusters", () => {
    expect(summary.pulls.n).toBeGreaterThanOrEqual(100);
    expect(summary.pulls.std.value).toBeGreaterThanOrEqual(0.9);
    expect(summary.pulls.std.value).toBeLessThanOrEqual(1.1);
    expect(Math.abs(summary.pulls.mean.value)).toBeLessThan(0.25);
  });

  it("has a median fractional Y bias within 3 % for clusters with S/N > 10", () => {
    expect(fracBiasHighSnr.length).toBeGreaterThanOrEqual(10);
    const s = [...fracBiasHighSnr].sort((a, b) => a - b);
    const med = s.length % 2 ? s[(s.length - 1) / 2]! : 0.5 * (s[s.length / 2 - 1]! + s[s.length / 2]!);
    expect(Math.abs(med)).toBeLessThanOrEqual(0.03);
  });

  it("has analytic errors within 10 % of the random-position scatter", () => {
    // per realisation the robust scatter of 400 correlated positions scatters by ~8 % between skies
    // (measured over 30 skies), so the 10 % floor is tested on the mean ratio over the 8 skies and
    // each single sky only for gross failures (within 35 %)
    const ratios = runs.map((r) => r.forced.diagnostics.randomScatter.map((d) => d.sigmaRandom / d.sigmaAnalytic));
    console.log("bias", JSON.stringify(summary.yBias.map((b) => [b.snrLo, b.n, b.fractionalBias.value.toFixed(3), b.meanPull.value.toFixed(2)])), "pulls", JSON.stringify(summary.pulls), "random/analytic σ per sky and size:", JSON.stringify(ratios.map((r) => r.map((x) => Number(x.toFixed(3))))));
    const all = ratios.flat();
    const mean = all.reduce((a, b) => a + b, 0) / all.length;
    expect(mean).toAllClose(1, { atol: 0.1, rtol: 0 });
    for (const x of all) expect(x).toAllClose(1, { atol: 0.35, rtol: 0 });
  });

  it("finds at least 90 % of clusters with true S/N >= 6", () => {
    const bins = summary.completeness.filter((b) => b.snrLo >= 6);
    const k = bins.reduce((a, b) => a + b.k, 0);
    const n = bins.reduce((a, b) => a + b.n, 0);
    expect(n).toBeGreaterThanOrEqual(20);
    expect(k / n).toBeGreaterThanOrEqual(0.9);
  });
});
