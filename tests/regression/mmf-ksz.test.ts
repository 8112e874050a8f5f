/**
 * Joint tSZ + kSZ fit on the invented ksz-sample scenario (8 clusters with line-of-sight
 * velocities; ΔT/T0 = −τ v_r/c, Sunyaev & Zel'dovich 1980): the recovered velocities scatter
 * around the truth with their errors, and the sign convention (v > 0 receding) holds.
 */
import { describe, expect, it } from "vitest";
import { loadScenario, simulateField } from "../../packages/simulate/src/index.js";
import { stackFromSimulatedField } from "../../packages/cli/src/commands/regress.js";
import { a10ProfileShape, measureClusters, stackSedProvider } from "../../packages/estimators/src/index.js";

describe("kSZ velocities from the joint fit", () => {
  it("recovers the line-of-sight velocities within their errors", async () => {
    const sc = await loadScenario("fixtures/scenarios/ksz-sample.json");
    const pulls: number[] = [];
    const signs: number[] = [];
    for (const seed of [5, 6]) {
      const field = simulateField(sc.scenario, seed, sc.cmbTable === undefined ? {} : { cmbTable: sc.cmbTable });
      const stack = stackFromSimulatedField(field);
      const truth = field.clusters.filter((c) => c.inField);
      const res = measureClusters(
        stack,
        truth.map((c) => ({ id: c.id, raDeg: c.raDeg, decDeg: c.decDeg, theta500Arcmin: c.theta500Arcmin, teKeV: c.kTeKeV })),
        { profile: a10ProfileShape(), seds: stackSedProvider(stack), relativistic: false, fitKsz: true, randomCount: 0 },
      );
      res.clusters.forEach((m, k) => {
        const t = truth[k]!;
        if (!Number.isFinite(m.vLosKms)) return;
        expect(m.vLosErrKms).toBeGreaterThan(0);
        pulls.push((m.vLosKms - t.vLosKmS) / m.vLosErrKms);
        if (Math.abs(t.vLosKmS) > 2.5 * m.vLosErrKms) signs.push(Math.sign(m.vLosKms) * Math.sign(t.vLosKmS));
      });
    }
    console.log("kSZ pulls", JSON.stringify(pulls.map((p) => Number(p.toFixed(2)))));
    expect(pulls.length).toBeGreaterThanOrEqual(12);
    const mean = pulls.reduce((a, b) => a + b, 0) / pulls.length;
    const sd = Math.sqrt(pulls.reduce((a, b) => a + (b - mean) ** 2, 0) / (pulls.length - 1));
    // ~16 velocities: sd has a ~18 % standard error, the mean ~0.25
    expect(sd).toBeLessThan(1.6);
    expect(Math.abs(mean)).toBeLessThan(0.9);
    expect(signs.every((s) => s === 1)).toBe(true);
  }, 240_000);
});
