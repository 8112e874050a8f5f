/**
 * Flat-sky power spectra, per-mode helpers, Gaussian realisations and convolution.
 * Outside facts used: white noise of per-pixel variance σ² has flat-sky C_ell = σ²·ΔΩ (common
 * practice, no source); the periodogram of a Gaussian field has mean C and, per independent complex
 * mode, variance C² (exponential |F|²; common practice, no source), so a bin of n full-plane modes
 * (n/2 independent) scatters by C·sqrt(2/n).
 */
import { describe, expect, it } from "vitest";
import { createRng, arcminToRad, UmbraError } from "@umbra/core";
import {
  convolveMap,
  crossPowerBinned,
  ellOfModes,
  gaussianRealisation,
  getRfft2Plan,
  kxKyOfModes,
  multiplyModes,
  multiplyModesComplex,
  powerSpectrum2d,
} from "../src/fourier/index.js";
import type { FlatGeometry } from "../src/types.js";

function linearEdges(lo: number, hi: number, n: number): Float64Array {
  return Float64Array.from({ length: n + 1 }, (_, i) => lo + ((hi - lo) * i) / n);
}

describe("per-mode helpers", () => {
  it("ellOfModes gives 2π·sqrt((kx/(nx·dx))² + (ky/(ny·dy))²) for rectangular pixels", () => {
    const geom: FlatGeometry = { nx: 10, ny: 8, dxRad: 1e-3, dyRad: 2e-3 };
    const layout = getRfft2Plan(10, 8).layout;
    const ell = ellOfModes(layout, geom);
    const { kx, ky } = kxKyOfModes(layout, geom);
    let found = 0;
    for (let m = 0; m < layout.modeCount; m++) {
      if (layout.kxIndex[m] === 3 && layout.kyIndex[m] === -2) {
        found++;
        expect(ell[m]).toAllClose(2 * Math.PI * Math.hypot(3 / (10 * 1e-3), 2 / (8 * 2e-3)), { rtol: 1e-15 });
        expect(kx[m]).toAllClose(300, { rtol: 1e-15 });
        expect(ky[m]).toAllClose(-125, { rtol: 1e-15 });
      }
      if (layout.kxIndex[m] === 0 && layout.kyIndex[m] === 0) expect(ell[m]).toBe(0);
    }
    expect(found).toBe(1);
  });

  it("ellOfModes rejects a geometry of another shape", () => {
    const layout = getRfft2Plan(10, 8).layout;
    expect(() => ellOfModes(layout, { nx: 8, ny: 10, dxRad: 1e-3, dyRad: 1e-3 })).toThrow(UmbraError);
  });

  it("multiplyModes scales re and im of each mode, in place or into a new array", () => {
    const spec = Float64Array.from([1, 2, 3, -4, 5, 6]);
    const w = Float64Array.from([2, 0.5, -1]);
    expect(multiplyModes(spec, w)).toAllClose([2, 4, 1.5, -2, -5, -6], { rtol: 0, atol: 0 });
    multiplyModes(spec, w, spec);
    expect(spec).toAllClose([2, 4, 1.5, -2, -5, -6], { rtol: 0, atol: 0 });
    expect(() => multiplyModes(spec, Float64Array.from([1, 2]))).toThrow(/twice/);
  });

  it("multiplyModesComplex multiplies complex modes, optionally conjugating b", () => {
    const a = Float64Array.from([1, 2, 0, 1]);
    const b = Float64Array.from([3, -1, 0, 1]);
    // (1+2i)(3−i) = 5+5i ; i·i = −1 ; (1+2i)(3+i) = 1+7i ; i·(−i) = 1
    expect(multiplyModesComplex(a, b)).toAllClose([5, 5, -1, 0], { rtol: 0, atol: 1e-15 });
    expect(multiplyModesComplex(a, b, undefined, true)).toAllClose([1, 7, 1, 0], { rtol: 0, atol: 1e-15 });
  });
});

describe("flat-sky power spectrum normalisation", () => {
  it("white noise of per-pixel σ has C_ell = σ²·ΔΩ (mean over all modes within 4 standard errors; chi-square over bins)", () => {
    const geom: FlatGeometry = { nx: 256, ny: 192, dxRad: arcminToRad(0.5), dyRad: arcminToRad(0.75) };
    const sigma = 3e-6;
    const map = new Float64Array(geom.nx * geom.ny);
    createRng(11).fillNormal(map);
    for (let i = 0; i < map.length; i++) map[i] = (map[i] as number) * sigma;
    const plan = getRfft2Plan(geom.nx, geom.ny);
    const spec = new Float64Array(plan.layout.spectrumLength);
    plan.forward(map, spec);
    const expected = sigma * sigma * geom.dxRad * geom.dyRad;
    const edges = linearEdges(100, 14000, 20);
    const { cl, modeCounts, ellCenters } = crossPowerBinned(spec, spec, plan.layout, geom, edges);
    let chi2 = 0;
    let total = 0;
    let nTotal = 0;
    for (let i = 0; i < cl.length; i++) {
      const n = modeCounts[i] as number;
      expect(n).toBeGreaterThan(50);
      expect(ellCenters[i]).toBeGreaterThanOrEqual(edges[i] as number);
      expect(ellCenters[i]).toBeLessThan(edges[i + 1] as number);
      chi2 += (((cl[i] as number) - expected) / (expected * Math.sqrt(2 / n))) ** 2;
      total += (cl[i] as number) * n;
      nTotal += n;
    }
    // 20 degrees of freedom: the 99.9 % point of chi-square(20) is 45.3 (standard tables)
    expect(chi2).toBeLessThan(45.3);
    expect(total / nTotal).toAllClose(expected, { rtol: 4 * Math.sqrt(2 / nTotal) });
  });

  it("powerSpectrum2d averaged with Hermitian weights over every mode equals ΔΩ·mean(f²) exactly (Parseval)", () => {
    const geom: FlatGeometry = { nx: 30, ny: 21, dxRad: 1e-3, dyRad: 1.5e-3 };
    const map = new Float64Array(geom.nx * geom.ny);
    createRng(5).fillNormal(map);
    const plan = getRfft2Plan(geom.nx, geom.ny);
    const spec = new Float64Array(plan.layout.spectrumLength);
    plan.forward(map, spec);
    const p = powerSpectrum2d(spec, spec, plan.layout, geom);
    let s = 0;
    for (let m = 0; m < p.length; m++) s += (plan.layout.hermitianWeight[m] as number) * (p[m] as number);
    let f2 = 0;
    for (const v of map) f2 += v * v;
    expect(s / (geom.nx * geom.ny)).toAllClose((geom.dxRad * geom.dyRad * f2) / map.length, { rtol: 1e-12 });
  });

  it("cross power of a map with a scaled copy is the scale times the auto power; empty bins are NaN", () => {
    const geom: FlatGeometry = { nx: 32, ny: 32, dxRad: 1e-3, dyRad: 1e-3 };
    const map = new Float64Array(32 * 32);
    createRng(3).fillNormal(map);
    const plan = getRfft2Plan(32, 32);
    const a = new Float64Array(plan.layout.spectrumLength);
    plan.forward(map, a);
    const b = a.map((v) => -2.5 * v);
    const edges = Float64Array.from([0.5, 1000, 5000, 20000, 1e7, 2e7]);
    const auto = crossPowerBinned(a, a, plan.layout, geom, edges);
    const cross = crossPowerBinned(a, b, plan.layout, geom, edges);
    expect(cross.cl.subarray(0, 4)).toAllClose(auto.cl.subarray(0, 4).map((v) => -2.5 * v), { rtol: 1e-14 });
    expect(Number.isNaN(cross.cl[4])).toBe(true);
    expect(cross.modeCounts[4]).toBe(0);
    expect(() => crossPowerBinned(a, a, plan.layout, geom, Float64Array.from([5, 5, 6]))).toThrow(UmbraError);
  });
});

describe("gaussianRealisation", () => {
  const geom: FlatGeometry = { nx: 200, ny: 150, dxRad: arcminToRad(1), dyRad: arcminToRad(1.5) };
  const cl = (ell: number): number => 1e-14 * (1 + (ell / 800) ** -2.5);

  it("recovers its input C_ell within cosmic variance (chi-square over 25 bins)", () => {
    const map = gaussianRealisation(cl, geom, createRng(2026));
    const plan = getRfft2Plan(geom.nx, geom.ny);
    const spec = new Float64Array(plan.layout.spectrumLength);
    plan.forward(map, spec);
    const edges = linearEdges(150, 7000, 25);
    const est = crossPowerBinned(spec, spec, plan.layout, geom, edges);
    // expected value of each bin: the Hermitian-weighted mean of the true C over its modes
    const ell = ellOfModes(plan.layout, geom);
    const truth = new Float64Array(25);
    const count = new Float64Array(25);
    for (let m = 0; m < ell.length; m++) {
      const l = ell[m] as number;
      if (l < 150 || l >= 7000) continue;
      const i = Math.floor((l - 150) / ((7000 - 150) / 25));
      const w = plan.layout.hermitianWeight[m] as number;
      truth[i] = (truth[i] as number) + w * cl(l);
      count[i] = (count[i] as number) + w;
    }
    let chi2 = 0;
    for (let i = 0; i < 25; i++) {
      const t = (truth[i] as number) / (count[i] as number);
      expect(est.modeCounts[i]).toBe(count[i]);
      chi2 += (((est.cl[i] as number) - t) / (t * Math.sqrt(2 / (count[i] as number)))) ** 2;
    }
    // 99.9 % point of chi-square(25) is 52.6 (standard tables)
    expect(chi2).toBeLessThan(52.6);
  });

  it("has zero mean, accepts a table C_ell, and gives the same map for the same seed", () => {
    const table = { ell: Float64Array.from([0, 20000]), cl: Float64Array.from([2e-14, 2e-14]) };
    const a = gaussianRealisation(table, geom, createRng(9));
    const b = gaussianRealisation(table, geom, createRng(9));
    expect(a).toAllClose(b, { rtol: 0, atol: 0 });
    let mean = 0;
    let var2 = 0;
    for (const v of a) mean += v;
    mean /= a.length;
    for (const v of a) var2 += (v - mean) ** 2;
    var2 /= a.length;
    expect(mean).toAllClose(0, { atol: 1e-12 * Math.sqrt(var2) });
    // flat C over every mode = white noise of variance C/ΔΩ (table covers the corner ell ≈ 13 000)
    expect(var2).toAllClose(2e-14 / (geom.dxRad * geom.dyRad), { rtol: 4 * Math.sqrt(2 / a.length) });
  });

  it("rejects a negative C_ell and a malformed table", () => {
    expect(() => gaussianRealisation(() => -1, geom, createRng(1))).toThrow(/C_ell/);
    expect(() => gaussianRealisation({ ell: Float64Array.from([1, 1]), cl: Float64Array.from([1, 1]) }, geom, createRng(1))).toThrow(UmbraError);
  });
});

describe("convolveMap", () => {
  it("returns the map for a unit transfer, and keeps the map sum while lowering its variance for a Gaussian beam transfer", () => {
    const geom: FlatGeometry = { nx: 24, ny: 18, dxRad: 1e-3, dyRad: 1e-3 };
    const map = new Float64Array(24 * 18);
    createRng(4).fillNormal(map);
    const layout = getRfft2Plan(24, 18).layout;
    const ones = new Float64Array(layout.modeCount).fill(1);
    expect(convolveMap(map, ones, geom)).toAllClose(map, { rtol: 0, atol: 1e-14 });
    const ell = ellOfModes(layout, geom);
    const sigmaRad = 2e-3;
    const beam = ell.map((l) => Math.exp(-0.5 * l * l * sigmaRad * sigmaRad));
    const out = convolveMap(map, beam, geom);
    const sum = (a: Float64Array): number => a.reduce((s, v) => s + v, 0);
    expect(sum(out)).toAllClose(sum(map), { rtol: 1e-12, atol: 1e-12 });
    // smoothing lowers the variance
    expect(out.reduce((s, v) => s + v * v, 0)).toBeLessThan(map.reduce((s, v) => s + v * v, 0));
  });

  it("convolving with a one-pixel delta kernel's transfer shifts the map by one pixel", () => {
    const geom: FlatGeometry = { nx: 15, ny: 10, dxRad: 1e-3, dyRad: 1e-3 };
    const plan = getRfft2Plan(15, 10);
    const delta = new Float64Array(150);
    delta[1 * 15 + 2] = 1; // shift by (2, 1)
    const dspec = new Float64Array(plan.layout.spectrumLength);
    plan.forward(delta, dspec);
    const map = new Float64Array(150);
    createRng(8).fillNormal(map);
    // a delta's spectrum is complex, so use multiplyModesComplex on the map's spectrum
    const spec = new Float64Array(plan.layout.spectrumLength);
    plan.forward(map, spec);
    multiplyModesComplex(spec, dspec, spec);
    const out = new Float64Array(150);
    plan.inverse(spec, out);
    const expected = new Float64Array(150);
    for (let y = 0; y < 10; y++) for (let x = 0; x < 15; x++) expected[((y + 1) % 10) * 15 + ((x + 2) % 15)] = map[y * 15 + x] as number;
    expect(out).toAllClose(expected, { rtol: 0, atol: 1e-13 });
    expect(() => convolveMap(map, new Float64Array(3), geom)).toThrow(UmbraError);
  });
});
