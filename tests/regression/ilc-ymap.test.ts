/**
 * Regression of the ILC path on simulated fields (fixed seeds): y maps from @umbra/simulate stacks
 * with primary CMB, a partially decorrelated dust/CIB component, atmospheric and white noise, and
 * A10 clusters; aperture photometry on the y map (`measure --method ilc`) must give unbiased Y5R500
 * with calibrated errors, and the constrained ILC must remove the CMB.
 */
import { describe, expect, it } from "vitest";
import { fourierShape, gnfwA10, profileFourierAtEll } from "../../packages/clusters/src/index.js";
import { gaussianBeam } from "../../packages/maps/src/index.js";
import { parseScenario, simulateField, type SimulatedField } from "../../packages/simulate/src/index.js";
import { applyYMapWeights, buildYMap, ilcBandsFromStack } from "../../packages/estimators/src/ilc/index.js";
import { measureCatalogByIlc } from "../../packages/estimators/src/aperture/index.js";
import type { BandStack } from "../../packages/estimators/src/stack/types.js";
import type { CatalogueCluster } from "../../packages/estimators/src/photometry/types.js";
import type { ProfileShape } from "../../packages/estimators/src/mmf/profile.js";

/** The simulator's A10 shape (truncated at 5 R500) as a ProfileShape: g(u) = F̃(u) at θ500 = 1 rad. */
const a10: ProfileShape = (() => {
  const shape = fourierShape(gnfwA10());
  return { name: "gnfw-a10", fourierUnitScale: (u: Float64Array) => profileFourierAtEll(shape, 1, u) };
})();

/** An invented survey: 5 bands, 0.5′ pixels, 256² (≈ 4.6 deg²), clusters on a jittered 6 × 6 grid. */
function scenario(withClusters: boolean, noise: boolean): unknown {
  const clusters: unknown[] = [];
  for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) {
    const k = i * 6 + j;
    clusters.push({
      id: `ILCREG-${k}`,
      raDeg: 30 + (i - 2.5) * 0.3 + 0.02 * Math.sin(3.1 * k),
      decDeg: -5 + (j - 2.5) * 0.3 + 0.02 * Math.cos(1.7 * k),
      m500Msun: 3e14 * (1 + 3 * ((k * 0.618) % 1)),
      z: 0.25 + 0.45 * ((k * 0.381) % 1),
    });
  }
  const band = (name: string, f: number, fwhm: number, depth: number) => ({ name, frequencyGHz: f, beamFwhmArcmin: fwhm, unit: "uK_CMB", noiseUKArcmin: noise ? depth : 0, ...(noise ? { atmosphere: { ellKnee: 1500, slope: -3.5 } } : {}) });
  return {
    name: "ilc-regression",
    field: { nx: 256, ny: 256, pixelArcmin: 0.5, projection: "TAN", centerDeg: [30, -5], fieldId: "ILCREG-F1" },
    bands: [band("b090", 90, 2.2, 18), band("b150", 150, 1.4, 12), band("b220", 220, 1.0, 30), band("b280", 280, 0.9, 60), band("b350", 350, 0.8, 150)],
    sky: {
      cmb: { spectrum: "lcdm2018" },
      ...(withClusters ? { clusters: { list: clusters, scatterLnY: 0, relativistic: false } } : {}),
      ...(noise ? { dust: { refFrequencyGHz: 353, dellAt3000UK2: 80, ellIndex: -1.2, beta: 1.6, temperatureK: 20, bandCorrelation: 0.98 } } : {}),
    },
  };
}

function stackOf(field: SimulatedField): BandStack {
  return {
    nx: field.geometry.nx,
    ny: field.geometry.ny,
    geometry: field.geometry,
    wcs: field.wcs,
    warnings: [],
    inputs: [],
    bands: field.bands.map((b) => {
      const beam = gaussianBeam(b.beamFwhmArcmin);
      return {
        name: b.name,
        spectral: b.band,
        beam: (ells: Float64Array) => beam.transferOnEll(ells),
        beamFwhmArcmin: b.beamFwhmArcmin,
        data: b.map.map((v) => v / b.kcmbToUnit),
        ivar: null,
        mask: null,
      };
    }),
  };
}

describe("ILC y maps on simulated fields (regression)", () => {
  it("aperture photometry on the y map gives unbiased Y5R500 with calibrated errors over 100+ clusters", () => {
    const pulls: number[] = [];
    const fracHighSnr: number[] = [];
    const errRatio: number[] = [];
    for (const seed of [501, 502, 503]) {
      const field = simulateField(parseScenario(scenario(true, true), "ilc-regression"), seed);
      const rows: CatalogueCluster[] = field.clusters.map((c, k) => ({ id: c.id, raDeg: c.raDeg, decDeg: c.decDeg, theta500Arcmin: c.theta500Arcmin, row: k + 1 }));
      const res = measureCatalogByIlc(stackOf(field), rows, { profile: a10, ymap: { ilc: "scale" }, randomCount: 100, seed });
      expect(res.ymap.biasWithinLimit).toBe(true);
      res.clusters.forEach((m, k) => {
        const truth = field.clusters[k]!;
        if (m.flags.length > 0) return;
        pulls.push((m.yArcmin2 - truth.y5r500Arcmin2) / m.yErrArcmin2);
        if (m.snr > 10) fracHighSnr.push(m.yArcmin2 / truth.y5r500Arcmin2 - 1);
        errRatio.push(m.y0ErrRandom / m.y0Err);
      });
    }
    const n = pulls.length;
    const mean = pulls.reduce((s, v) => s + v, 0) / n;
    const sd = Math.sqrt(pulls.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1));
    const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1]!;
    console.log(`ILC regression: n=${n}, mean pull ${mean.toFixed(3)}, pull sd ${sd.toFixed(3)}, S/N>10: n=${fracHighSnr.length}, median fractional bias ${median(fracHighSnr).toFixed(4)}, median random/analytic error ${median(errRatio).toFixed(3)}`);
    expect(n >= 100).toBe(true);
    expect(sd > 0.9 && sd < 1.1).toBe(true);
    expect(Math.abs(mean) < 3 / Math.sqrt(n)).toBe(true);
    expect(Math.abs(median(fracHighSnr)) < 0.03).toBe(true);
    expect(median(errRatio)).toAllClose(1, { atol: 0.1 });
  });

  it("the constrained ILC removes the CMB from the y map; the standard ILC leaves some", () => {
    const sc = parseScenario(scenario(true, true), "ilc-regression");
    const field = simulateField(sc, 511);
    const cmbOnly = simulateField(parseScenario(scenario(false, false), "ilc-regression-cmb"), 511);
    const bands = ilcBandsFromStack(stackOf(field));
    const cmbBands = ilcBandsFromStack(stackOf(cmbOnly));
    const rms = (a: Float64Array) => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);
    const cmbRmsK = rms(cmbBands[1]!.map);
    const std = buildYMap(bands, field.geometry, { ilc: "standard" });
    const con = buildYMap(bands, field.geometry, { ilc: "constrained", deproject: ["cmb"] });
    const leakStd = rms(applyYMapWeights(std, cmbBands)) / cmbRmsK;
    const leakCon = rms(applyYMapWeights(con, cmbBands)) / cmbRmsK;
    console.log(`CMB leakage (y per K_CMB rms): standard ${leakStd.toExponential(3)}, constrained ${leakCon.toExponential(3)}`);
    // the simulator's beam is exp(−ℓ²σ²/2), the stack's exp(−ℓ(ℓ+1)σ²/2): the mismatch leaves ~1e-4 of the CMB
    expect(leakCon < 1e-3 * leakStd).toBe(true);
  });
});
