import { describe, expect, it } from "vitest";
import { UmbraError, createRng } from "@umbra/core";
import { adaptiveBinEdges, estimateBandCovariance } from "../src/noise/estimate.js";
import { setup } from "./mmf-helpers.js";

function spectra(s: ReturnType<typeof setup>, maps: Float64Array[]): Float64Array[] {
  return maps.map((m) => {
    const out = new Float64Array(s.layout.spectrumLength);
    s.plan.forward(m, out);
    return out;
  });
}

describe("band covariance from the maps", () => {
  const s = setup(128, 1);
  const omega = s.geom.dxRad * s.geom.dyRad;
  const npix = 128 * 128;

  it("recovers the per-pixel covariance of correlated white noise (C = Σ·Ω_pix)", () => {
    const rng = createRng(3);
    const a = rng.fillNormal(new Float64Array(npix)) as Float64Array;
    const b = rng.fillNormal(new Float64Array(npix)) as Float64Array;
    // band 1 = 2a, band 2 = a + b: Σ = [[4, 2], [2, 2]] per pixel
    const m1 = a.map((v) => 2 * v);
    const m2 = a.map((v, p) => v + (b[p] as number));
    const cov = estimateBandCovariance(spectra(s, [m1, m2]), s.layout, s.geom, s.ells, { smoothPasses: 0, minModes: 2000 });
    const nb = cov.ellCentres.length;
    let c11 = 0, c12 = 0, c22 = 0, n = 0;
    for (let k = 0; k < nb; k++) {
      c11 += cov.values[k * 4]! * cov.modeCounts[k]!;
      c12 += cov.values[k * 4 + 1]! * cov.modeCounts[k]!;
      c22 += cov.values[k * 4 + 3]! * cov.modeCounts[k]!;
      n += cov.modeCounts[k]!;
    }
    // mode-count weighted means over ~16k modes: 1 % sampling error; allow 4 %
    expect([c11 / n / omega, c12 / n / omega, c22 / n / omega]).toAllClose([4, 2, 2], { rtol: 0.04 });
    for (const v of cov.values) expect(Number.isFinite(v)).toBe(true);
    expect(cov.loading.every((x) => x === 0)).toBe(true);
  });

  it("puts at least minModes full-plane modes in every adaptive bin", () => {
    const edges = adaptiveBinEdges(s.ells, s.layout.hermitianWeight, 50, 300);
    const counts = new Float64Array(edges.length - 1);
    for (let m = 0; m < s.ells.length; m++) {
      const l = s.ells[m]!;
      for (let k = 0; k < counts.length; k++) if (l >= edges[k]! && l < edges[k + 1]!) counts[k] += s.layout.hermitianWeight[m]!;
    }
    expect(Math.min(...counts.slice(0, -1))).toBeGreaterThanOrEqual(300);
  });

  it("loads the diagonal of a singular (perfectly correlated) pair and reports the condition number", () => {
    const a = createRng(5).fillNormal(new Float64Array(npix)) as Float64Array;
    const cov = estimateBandCovariance(spectra(s, [a, Float64Array.from(a)]), s.layout, s.geom, s.ells, { maxCondition: 1e6 });
    expect(cov.loading.some((x) => x > 0)).toBe(true);
    for (const c of cov.conditionNumbers) expect(c).toBeLessThanOrEqual(1e6 * (1 + 1e-9));
  });

  it("refuses a constant map with BAD_DATA naming the band", () => {
    const a = createRng(6).fillNormal(new Float64Array(npix)) as Float64Array;
    const flat = new Float64Array(npix).fill(2.5);
    try {
      estimateBandCovariance(spectra(s, [a, flat]), s.layout, s.geom, s.ells, { bandNames: ["f090", "f150"] });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(UmbraError);
      expect((e as UmbraError).code).toBe("BAD_DATA");
      expect((e as UmbraError).message).toContain("f150");
    }
  });
});
