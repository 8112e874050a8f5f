/**
 * Physics of the simulated field, each checked against an outside statement:
 * the CMB map's power against the input C_ℓ within cosmic variance (chi-square), the white-noise
 * level measured back in µK·arcmin, the cluster count against the mass-function integral
 * (Poisson), the integrated Y of a painted cluster against the real-space profile integral of
 * @umbra/clusters, radio flux conservation and the dust/atmosphere band correlations.
 */
import { describe, expect, it } from "vitest";
import { ARCMIN2_PER_SR, RAD_PER_ARCMIN } from "@umbra/core";
import { clusterScale, cosmologyPreset, gnfwA10, yAtX } from "@umbra/clusters";
import { crossPowerBinned, ellOfModes, getRfft2Plan } from "@umbra/maps";
import { componentResponse } from "@umbra/spectra";
import { lcdmTtClK2 } from "../src/cmb/index.js";
import { parseScenario } from "../src/scenario/index.js";
import { drawClusters, fieldWcs, scenarioHaloGrid, simulateField } from "../src/sky/index.js";
import { createRng } from "@umbra/core";

function scenario(over: Record<string, unknown>, sky: Record<string, unknown> = {}, bands?: unknown[]) {
  return parseScenario(
    {
      name: "test",
      field: { nx: 256, ny: 256, pixelArcmin: 1, centerDeg: [40, -20], fieldId: "TEST-FIELD" },
      bands: bands ?? [{ name: "b150", frequencyGHz: 150, beamFwhmArcmin: 0.01, unit: "K_CMB", noiseUKArcmin: 0 }],
      sky,
      ...over,
    },
    "test.json",
  );
}

function meanVar(a: Float64Array): { mean: number; variance: number } {
  let m = 0;
  for (const x of a) m += x;
  m /= a.length;
  let v = 0;
  for (const x of a) v += (x - m) ** 2;
  return { mean: m, variance: v / (a.length - 1) };
}

describe("primary CMB", () => {
  it("has the input lensed-ΛCDM power within cosmic variance (chi-square over 20 bins)", () => {
    const s = scenario({}, { cmb: { spectrum: "lcdm2018" } });
    const f = simulateField(s, 11);
    const plan = getRfft2Plan(256, 256);
    const spec = new Float64Array(plan.layout.spectrumLength);
    plan.forward(f.bands[0]!.map, spec);
    const edges = Float64Array.from({ length: 21 }, (_, i) => 200 + i * 400);
    const p = crossPowerBinned(spec, spec, plan.layout, f.geometry, edges);
    // expected: the input C_ℓ averaged over the same modes (Hermitian weights)
    const ells = ellOfModes(plan.layout, f.geometry);
    const sum = new Float64Array(20);
    const sum2 = new Float64Array(20);
    const w = new Float64Array(20);
    for (let m = 0; m < ells.length; m++) {
      const b = Math.floor((ells[m]! - 200) / 400);
      if (b < 0 || b >= 20) continue;
      const c = lcdmTtClK2(ells[m]!);
      sum[b]! += plan.layout.hermitianWeight[m]! * c;
      sum2[b]! += plan.layout.hermitianWeight[m]! * c * c;
      w[b]! += plan.layout.hermitianWeight[m]!;
    }
    let chi2 = 0;
    for (let b = 0; b < 20; b++) {
      const model = sum[b]! / w[b]!;
      // cosmic variance of a bin average over N full-plane modes: Var(Ĉ) = 2 Σ C_m² / N² (each independent
      // complex mode appears twice in the full plane; Gaussian field, |a|² exponential; reduces to 2C²/N,
      // e.g. Knox 1995, PRD 52, 4307, eq. 8, when C is constant over the bin)
      expect(p.modeCounts[b]!).toAllClose(w[b]!, { rtol: 1e-12 });
      chi2 += (p.cl[b]! - model) ** 2 / ((2 * sum2[b]!) / (w[b]! * w[b]!));
    }
    // 20 degrees of freedom: P(χ² > 45.3) = 0.001 (chi-square table)
    expect(chi2).toBeLessThan(45.3);
    expect(chi2).toBeGreaterThan(5.9); // P(χ² < 5.9) ≈ 0.001: a too-perfect match would mean no randomness
  });
});

describe("noise", () => {
  it("measures the white-noise level back in µK·arcmin in K_CMB and in a MJy/sr band", () => {
    const bands = [
      { name: "a", frequencyGHz: 150, beamFwhmArcmin: 1, unit: "uK_CMB", noiseUKArcmin: 25 },
      { name: "b", frequencyGHz: 353, beamFwhmArcmin: 1, unit: "MJy/sr", noiseUKArcmin: 60 },
    ];
    const s = scenario({ field: { nx: 256, ny: 256, pixelArcmin: 0.5 } }, {}, bands);
    const f = simulateField(s, 5);
    const n = 256 * 256;
    // standard error of a sample standard deviation ≈ σ/√(2n) (from memory); 4σ bounds
    const a = Math.sqrt(meanVar(f.bands[0]!.map).variance) * 0.5; // µK·arcmin
    expect(a).toAllClose(25, { rtol: 4 / Math.sqrt(2 * n) });
    const bK = (Math.sqrt(meanVar(f.bands[1]!.map).variance) / Math.abs(f.bands[1]!.kcmbToUnit)) * 1e6 * 0.5;
    expect(bK).toAllClose(60, { rtol: 4 / Math.sqrt(2 * n) });
    // the ivar map states the same level
    expect(1 / Math.sqrt(f.bands[0]!.ivar![0]!)).toAllClose(25 / 0.5, { rtol: 1e-12 });
  });
  it("makes radial depth: corner pixels noisier than the centre by 1/sqrt(minRelative)", () => {
    const s = scenario({ depth: { kind: "radial", minRelative: 0.25 } }, {}, [{ name: "a", frequencyGHz: 150, beamFwhmArcmin: 1, unit: "uK_CMB", noiseUKArcmin: 10 }]);
    const f = simulateField(s, 6);
    const ivar = f.bands[0]!.ivar!;
    expect(ivar[0]! / ivar[128 * 256 + 128]!).toAllClose(0.25, { rtol: 0.01 });
    // pulls map·sqrt(ivar) have unit variance everywhere
    const pulls = f.bands[0]!.map.map((x, i) => x * Math.sqrt(ivar[i]!));
    expect(meanVar(pulls).variance).toAllClose(1, { rtol: 4 * Math.sqrt(2 / pulls.length) });
  });
  it("correlates the atmospheric component between bands with the stated coefficient", () => {
    const bands = [
      { name: "a", frequencyGHz: 90, beamFwhmArcmin: 1, unit: "uK_CMB", noiseUKArcmin: 1e-6, atmosphere: { ellKnee: 3000, slope: -3 } },
      { name: "b", frequencyGHz: 150, beamFwhmArcmin: 1, unit: "uK_CMB", noiseUKArcmin: 1e-6, atmosphere: { ellKnee: 3000, slope: -3 } },
    ];
    const f = simulateField(scenario({ atmosphereCorrelation: 0.7 }, {}, bands), 8);
    const a = f.bands[0]!.map;
    const b = f.bands[1]!.map;
    const ma = meanVar(a);
    const mb = meanVar(b);
    let c = 0;
    for (let i = 0; i < a.length; i++) c += (a[i]! - ma.mean) * (b[i]! - mb.mean);
    const r = c / (a.length - 1) / Math.sqrt(ma.variance * mb.variance);
    // red noise: few independent modes dominate, so a loose bound (common practice, no source)
    expect(r).toAllClose(0.7, { atol: 0.15 });
  });
});

describe("clusters", () => {
  it("draws a Poisson number of clusters around the mass-function integral over the field", () => {
    const s = parseScenario(
      {
        name: "counts",
        field: { nx: 256, ny: 256, pixelArcmin: 1, fieldId: "COUNT-TEST" },
        bands: [{ name: "a", frequencyGHz: 150, beamFwhmArcmin: 1, noiseUKArcmin: 10 }],
        sky: { clusters: { massFunction: { mMinMsun: 2e14, mMaxMsun: 2e15, zMin: 0.1, zMax: 1.5 } } },
      },
      "counts.json",
    );
    const cosmo = cosmologyPreset("cmb2018");
    const grid = scenarioHaloGrid(s, cosmo)!;
    const wcs = fieldWcs(s.field);
    const root = createRng(3);
    const counts: number[] = [];
    for (let i = 0; i < 25; i++) counts.push(drawClusters(s, cosmo, wcs, root.fork(i), grid).clusters.length);
    const lambda = grid.expectedTotal;
    const mean = counts.reduce((x, y) => x + y, 0) / counts.length;
    // Poisson: sample mean of 25 draws has standard error sqrt(λ/25); 4σ bound
    expect(Math.abs(mean - lambda)).toBeLessThan(4 * Math.sqrt(lambda / 25));
    expect(lambda).toBeGreaterThan(5);
  });
  it("paints a cluster whose integrated y equals the Y5R500 of the real-space profile integral", () => {
    const s = scenario({}, { clusters: { list: [{ id: "ONE", raDeg: 40.1, decDeg: -20.05, m500Msun: 6e14, z: 0.3 }], scatterLnY: 0 } }, [
      { name: "a", frequencyGHz: 150, beamFwhmArcmin: 1.5, unit: "K_CMB", noiseUKArcmin: 0 },
    ]);
    const f = simulateField(s, 1);
    const c = f.clusters[0]!;
    // painted with the relativistic spectrum at the cluster's kTe (the default)
    expect(f.scenario.sky.clusters?.relativistic).toBe(true);
    const resp = componentResponse({ kind: "tsz", kTeKeV: c.kTeKeV }, { frequencyGHz: 150 }, "K_CMB");
    let sum = 0;
    for (const x of f.bands[0]!.map) sum += x;
    const yArcmin2 = ((sum / resp) * (RAD_PER_ARCMIN * RAD_PER_ARCMIN) * ARCMIN2_PER_SR);
    // the beam keeps the integral (B(0) = 1); Y5R500 from @umbra/clusters (A10 profile, real-space integral)
    expect(yArcmin2).toAllClose(c.y5r500Arcmin2, { rtol: 1e-3 });
    // the peak lies at the true centre (within a pixel)
    let best = 0;
    for (let i = 1; i < f.bands[0]!.map.length; i++) if (f.bands[0]!.map[i]! < f.bands[0]!.map[best]!) best = i;
    expect(Math.abs((best % 256) - c.xPix)).toBeLessThanOrEqual(1);
    expect(Math.abs(Math.floor(best / 256) - c.yPix)).toBeLessThanOrEqual(1);
  });
  it("paints the beam-convolved radial profile of the real-space line-of-sight integral (A10) from 0.25 to 3 θ500", () => {
    // 0.25′ pixels, 1′ beam; expected: yAtX of @umbra/clusters (σ_T/(m_e c²) ∫P dl, Arnaud et al. 2010 eqs. 11–12,
    // real-space quadrature) convolved with the Gaussian beam by direct 2-D quadrature in polar coordinates
    const fwhm = 1;
    const s = scenario({ field: { nx: 256, ny: 256, pixelArcmin: 0.25, centerDeg: [40, -20] } }, { clusters: { list: [{ id: "P", raDeg: 40, decDeg: -20, m500Msun: 6e14, z: 0.3 }], scatterLnY: 0 } }, [
      { name: "a", frequencyGHz: 150, beamFwhmArcmin: fwhm, unit: "K_CMB", noiseUKArcmin: 0 },
    ]);
    const f = simulateField(s, 1);
    const c = f.clusters[0]!;
    const resp = componentResponse({ kind: "tsz", kTeKeV: c.kTeKeV }, { frequencyGHz: 150 }, "K_CMB");
    const cosmo = cosmologyPreset("cmb2018");
    const profile = gnfwA10({ m500Msun: c.m500Msun, h70: cosmo.h70 });
    const scale = clusterScale(c.m500Msun, c.z, cosmo);
    const sigma = fwhm / Math.sqrt(8 * Math.LN2); // arcmin
    const beamed = (rArcmin: number): number => {
      let sum = 0;
      let norm = 0;
      const nr = 32;
      const nphi = 48;
      for (let i = 0; i < nr; i++) {
        const rp = ((i + 0.5) / nr) * 5 * sigma;
        const g = Math.exp((-rp * rp) / (2 * sigma * sigma)) * rp;
        for (let j = 0; j < nphi; j++) {
          const phi = (2 * Math.PI * (j + 0.5)) / nphi;
          const d = Math.hypot(rArcmin - rp * Math.cos(phi), rp * Math.sin(phi));
          sum += g * yAtX(profile, scale, d / c.theta500Arcmin);
          norm += g;
        }
      }
      return sum / norm;
    };
    const map = f.bands[0]!.map;
    const at = (x: number, y: number): number => {
      const x0 = Math.floor(x);
      const y0 = Math.floor(y);
      const tx = x - x0;
      const ty = y - y0;
      const v = (i: number, j: number): number => map[j * 256 + i]!;
      return (1 - tx) * (1 - ty) * v(x0, y0) + tx * (1 - ty) * v(x0 + 1, y0) + (1 - tx) * ty * v(x0, y0 + 1) + tx * ty * v(x0 + 1, y0 + 1);
    };
    for (const xr of [0.25, 0.5, 1, 2, 3]) {
      const rPix = (xr * c.theta500Arcmin) / 0.25;
      const got = (at(c.xPix + rPix, c.yPix) + at(c.xPix - rPix, c.yPix) + at(c.xPix, c.yPix + rPix) + at(c.xPix, c.yPix - rPix)) / 4 / resp;
      expect(got).toAllClose(beamed(xr * c.theta500Arcmin), { rtol: 0.01 });
    }
  });
  it("keeps a listed cluster outside the grid in the truth (inField false) without painting it", () => {
    const bands = [{ name: "a", frequencyGHz: 150, beamFwhmArcmin: 1, unit: "K_CMB", noiseUKArcmin: 0 }];
    const out = [{ id: "FAR", raDeg: 50, decDeg: -20, m500Msun: 6e14, z: 0.3 }];
    const f = simulateField(scenario({}, { clusters: { list: out } }, bands), 1);
    expect(f.clusters[0]!.inField).toBe(false);
    expect(f.clusters[0]!.nearEdge).toBe(true);
    expect(f.bands[0]!.map.every((x) => x === 0)).toBe(true);
  });
  it("adds kSZ with the sign of ΔT/T0 = −τ v/c (a receding cluster is a cold spot at the tSZ null)", () => {
    const list = [{ id: "K", raDeg: 40, decDeg: -20, m500Msun: 6e14, z: 0.3, vLosKmS: 1000 }];
    const bands = [{ name: "n", frequencyGHz: 217.5, beamFwhmArcmin: 1, unit: "K_CMB", noiseUKArcmin: 0 }];
    // non-relativistic tSZ, so that 217.5 GHz is its null
    const f = simulateField(scenario({}, { clusters: { list, scatterLnY: 0, relativistic: false } }, bands), 1);
    const c = f.clusters[0]!;
    let sum = 0;
    for (const x of f.bands[0]!.map) sum += x;
    const tsz = componentResponse({ kind: "tsz" }, { frequencyGHz: 217.5 }, "K_CMB");
    // Σ T Ω = Y[sr] (r_tSZ + (τ0/y0)(v/c) r_kSZ), r_kSZ = −T0 (Sunyaev & Zel'dovich 1980, MNRAS 190, 413)
    const ySr = c.y5r500Arcmin2 / ARCMIN2_PER_SR;
    const expected = ySr * (tsz + (c.tau0 / c.y0) * (1000 / 299792.458) * -2.7255);
    expect(sum * (RAD_PER_ARCMIN * RAD_PER_ARCMIN)).toAllClose(expected, { rtol: 2e-3 });
    expect(expected).toBeLessThan(0);
  });
});

describe("foregrounds", () => {
  it("conserves radio flux: Σ map · ΔΩ in MJy/sr at the reference frequency is Σ S_i", () => {
    const s = scenario({}, { radio: { refFrequencyGHz: 150, densityPerDeg2: 20, minFluxJy: 0.001, maxFluxJy: 0.5, slope: 2.2 } }, [
      { name: "r", frequencyGHz: 150, beamFwhmArcmin: 1.2, unit: "MJy/sr", noiseUKArcmin: 0 },
    ]);
    const f = simulateField(s, 4);
    let sum = 0;
    for (const x of f.bands[0]!.map) sum += x;
    const fluxJy = f.radioSources.reduce((a, r) => a + r.fluxJyRef, 0);
    expect(sum * (RAD_PER_ARCMIN * RAD_PER_ARCMIN) * 1e6).toAllClose(fluxJy, { rtol: 1e-9 });
    // Poisson count: λ = 20 / deg² × (256′)² ≈ 364; 5σ
    expect(Math.abs(f.radioSources.length - 364.1)).toBeLessThan(5 * Math.sqrt(364.1));
  });
  it("decorrelates the dust field between bands to the stated coefficient", () => {
    const dust = { refFrequencyGHz: 220, dellAt3000UK2: 50, ellIndex: -1.2, beta: 1.6, temperatureK: 20, bandCorrelation: 0.6 };
    const bands = [
      { name: "d1", frequencyGHz: 150, beamFwhmArcmin: 0.01, unit: "K_CMB", noiseUKArcmin: 0 },
      { name: "d2", frequencyGHz: 220, beamFwhmArcmin: 0.01, unit: "K_CMB", noiseUKArcmin: 0 },
    ];
    const f = simulateField(scenario({}, { dust }, bands), 9);
    const a = meanVar(f.bands[0]!.map);
    const b = meanVar(f.bands[1]!.map);
    let c = 0;
    for (let i = 0; i < f.bands[0]!.map.length; i++) c += (f.bands[0]!.map[i]! - a.mean) * (f.bands[1]!.map[i]! - b.mean);
    expect(c / (f.bands[0]!.map.length - 1) / Math.sqrt(a.variance * b.variance)).toAllClose(0.6, { atol: 0.05 });
    // amplitude ratio follows the modified-blackbody SED in K_CMB (Hildebrand 1983 via @umbra/spectra)
    const comp = { kind: "dust", beta: 1.6, temperatureK: 20, refFrequencyGHz: 220 } as const;
    const ratio = componentResponse(comp, { frequencyGHz: 150 }, "K_CMB") / componentResponse(comp, { frequencyGHz: 220 }, "K_CMB");
    expect(Math.sqrt(a.variance / b.variance)).toAllClose(ratio, { rtol: 0.05 });
  });
});

describe("determinism", () => {
  it("gives identical maps and truth for the same seed, different maps for another seed", () => {
    const s = scenario({}, { cmb: { spectrum: "lcdm2018" }, clusters: { massFunction: { mMinMsun: 3e14, mMaxMsun: 2e15, zMin: 0.1, zMax: 1 } } }, [
      { name: "a", frequencyGHz: 150, beamFwhmArcmin: 1.4, unit: "uK_CMB", noiseUKArcmin: 10 },
    ]);
    const a = simulateField(s, 77);
    const b = simulateField(s, 77);
    const c = simulateField(s, 78);
    expect(Buffer.from(a.bands[0]!.map.buffer).equals(Buffer.from(b.bands[0]!.map.buffer))).toBe(true);
    expect(JSON.stringify(a.clusters)).toBe(JSON.stringify(b.clusters));
    expect(Buffer.from(a.bands[0]!.map.buffer).equals(Buffer.from(c.bands[0]!.map.buffer))).toBe(false);
  });
});

describe("log-normal dust", () => {
  it("keeps the target variance (the two-point function at zero lag), a zero mean, and is positively skewed", () => {
    const dust = { refFrequencyGHz: 220, dellAt3000UK2: 50, ellIndex: -1.2, beta: 1.6, temperatureK: 20, bandCorrelation: 1, distribution: "lognormal", lognormalRelativeRms: 0.8 };
    const bands = [{ name: "d", frequencyGHz: 220, beamFwhmArcmin: 0.01, unit: "K_CMB", noiseUKArcmin: 0 }];
    const f = simulateField(scenario({}, { dust }, bands), 21);
    const map = f.bands[0]!.map;
    const { mean, variance } = meanVar(map);
    // target variance: Σ_modes w C(ℓ)/ΔΩ / N (the covariance at zero lag of the FFT normalisation)
    const plan = getRfft2Plan(256, 256);
    const ells = ellOfModes(plan.layout, f.geometry);
    const c3000 = (2 * Math.PI * 50e-12) / (3000 * 3001);
    const pix = (RAD_PER_ARCMIN * RAD_PER_ARCMIN);
    let target = 0;
    for (let m = 1; m < ells.length; m++) if (ells[m]! > 0) target += (plan.layout.hermitianWeight[m]! * c3000 * (ells[m]! / 3000) ** -1.2) / pix;
    target /= 256 * 256;
    expect(variance).toAllClose(target, { rtol: 0.1 });
    expect(Math.abs(mean)).toBeLessThan(0.1 * Math.sqrt(variance));
    let m3 = 0;
    for (const x of map) m3 += (x - mean) ** 3;
    const skew = m3 / map.length / variance ** 1.5;
    // a log-normal field of relative rms s has skewness 3s + s³ (Johnson & Kotz; from memory): 2.9 for s = 0.8
    expect(skew).toBeGreaterThan(1.5);
    expect(skew).toBeLessThan(4.5);
  });
});
