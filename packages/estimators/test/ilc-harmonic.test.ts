import { describe, expect, it } from "vitest";
import { createRng, type Rng } from "@umbra/core";
import { getRfft2Plan, type SpectrumLayout } from "@umbra/maps";
import { cosineEllWindows, harmonicIlc, type HarmonicIlcInput } from "../src/ilc/index.js";

/** ell of each stored mode for square pixels of `pixRad` (ell = 2π|k|, k in cycles per radian). */
function ells(layout: SpectrumLayout, pixRad: number): Float64Array {
  const out = new Float64Array(layout.modeCount);
  for (let k = 0; k < layout.modeCount; k++) {
    const kx = (layout.kxIndex[k] as number) / (layout.nx * pixRad);
    const ky = (layout.kyIndex[k] as number) / (layout.ny * pixRad);
    out[k] = 2 * Math.PI * Math.hypot(kx, ky);
  }
  return out;
}

const PIX = (1 / 60) * (Math.PI / 180); // 1 arcmin

function fft(map: Float64Array, n: number): Float64Array {
  const plan = getRfft2Plan(n, n);
  const s = new Float64Array(plan.layout.spectrumLength);
  plan.forward(map, s);
  return s;
}

function gaussianField(rng: Rng, n: number, sigma: number): Float64Array {
  const f = new Float64Array(n * n);
  rng.fillNormal(f);
  for (let i = 0; i < f.length; i++) f[i] = (f[i] as number) * sigma;
  return f;
}

/** m band maps: a·s + cmb + white noise per band (all in the same unit). */
function bands(a: number[], s: Float64Array, cmb: Float64Array, noise: number[], rng: Rng, n: number): Float64Array[] {
  return a.map((ai, i) => {
    const nz = gaussianField(rng, n, noise[i] as number);
    for (let p = 0; p < nz.length; p++) nz[p] = (nz[p] as number) + ai * (s[p] as number) + (cmb[p] as number);
    return nz;
  });
}

function dotModes(x: Float64Array, y: Float64Array, layout: SpectrumLayout, sel?: (k: number) => boolean): number {
  let acc = 0;
  for (let k = 0; k < layout.modeCount; k++) {
    if (sel && !sel(k)) continue;
    acc += (layout.hermitianWeight[k] as number) * ((x[2 * k] as number) * (y[2 * k] as number) + (x[2 * k + 1] as number) * (y[2 * k + 1] as number));
  }
  return acc;
}

const ones = (layout: SpectrumLayout, m: number): Float64Array[] => Array.from({ length: m }, () => new Float64Array(layout.modeCount).fill(1));

describe("harmonic (scale-dependent) ILC", () => {
  const tsz = [-0.95, -0.5, 0.3, 1.9]; // K_CMB per unit y at 100/150/217/353-like bands (shape only)
  const n = 64;
  const plan = getRfft2Plan(n, n);
  const layout = plan.layout;
  const ell = ells(layout, PIX);

  function run(extra: Partial<HarmonicIlcInput>, seed: number) {
    const rng = createRng(seed);
    const s = gaussianField(rng, n, 1);
    const cmb = gaussianField(rng, n, 30);
    const maps = bands(tsz, s, cmb, [0.5, 0.3, 0.4, 1.2], rng, n);
    const spectra = maps.map((mp) => fft(mp, n));
    const input: HarmonicIlcInput = {
      layout,
      ellPerMode: ell,
      covarianceSpectra: spectra,
      synthesisSpectra: spectra,
      beamRatio: ones(layout, 4),
      constraints: [Float64Array.from(tsz)],
      windows: cosineEllWindows([3000, 8000], 0.5),
      maxBiasFraction: 1,
      ...extra,
    };
    return { s, cmb, spectra, input, result: harmonicIlc(input) };
  }

  it("has exactly unit response to the target at every scale (pure-signal synthesis returns the signal)", () => {
    const { s, input } = run({}, 11);
    // apply the same weights to maps holding only a·s: the windows sum to one, wᵀa = 1 ⇒ output = s
    const pure = tsz.map((ai) => fft(s.map((v) => ai * v), n));
    const res = harmonicIlc({ ...input, synthesisSpectra: pure });
    const out = new Float64Array(n * n);
    plan.inverse(res.spectrum, out);
    let mean = 0;
    for (const v of s) mean += v / s.length;
    expect(out).toAllClose(s.map((v) => v - mean), { rtol: 0, atol: 1e-11 }); // ℓ = 0 removed by design
  });

  it("zeroes the CMB exactly when it is deprojected, and not otherwise", () => {
    const { cmb, input } = run({ constraints: [Float64Array.from(tsz), Float64Array.from([1, 1, 1, 1])] }, 12);
    const pureCmb = tsz.map(() => fft(cmb, n));
    const out = harmonicIlc({ ...input, synthesisSpectra: pureCmb }).spectrum;
    const cmbPower = dotModes(pureCmb[0] as Float64Array, pureCmb[0] as Float64Array, layout);
    expect(dotModes(out, out, layout) / cmbPower).toAllClose(0, { atol: 1e-24 });
    const std = run({}, 12);
    const outStd = harmonicIlc({ ...std.input, synthesisSpectra: pureCmb }).spectrum;
    expect(dotModes(outStd, outStd, layout) / cmbPower > 1e-8).toBe(true);
  });

  it("merges windows until every window's bias fraction (m − k)/N_p is under the limit", () => {
    // 64×64 map of 1′ pixels: ℓ spacing ≈ 338; a window below ℓ = 700 holds only ~10 modes
    const { result } = run({ windows: cosineEllWindows([700, 1500, 4000, 9000], 0.3), maxBiasFraction: 0.01 }, 13);
    expect(result.merges > 0).toBe(true);
    expect(result.biasWithinLimit).toBe(true);
    for (const d of result.domains) expect(d.biasFraction <= 0.01).toBe(true);
    // and the reported fraction is (m − k)/N_p
    for (const d of result.domains) expect(d.biasFraction).toAllClose(3 / d.independentModes, { rtol: 1e-12 });
  });

  it("reports when one window cannot meet the limit", () => {
    const { result } = run({ windows: cosineEllWindows([], 0.5), maxBiasFraction: 1e-5 }, 14);
    expect(result.domains.length).toBe(1);
    expect(result.biasWithinLimit).toBe(false);
  });

  it("brings bands to the common beam: the signal comes out convolved with the effective beam only", () => {
    const rng = createRng(15);
    const s = gaussianField(rng, n, 1);
    const sigma = (fwhmArcmin: number): number => (fwhmArcmin * PIX) / Math.sqrt(8 * Math.LN2);
    const fwhm = [4, 2.5, 1.5, 1.5];
    const beam = (f: number) => ell.map((l) => Math.exp(-0.5 * l * l * sigma(f) ** 2)); // Gaussian B_ℓ, common practice
    const bEff = beam(4);
    const sSpec = fft(s, n);
    const conv = (spec: Float64Array, b: Float64Array, scale: number) => spec.map((v, i) => v * (b[i >> 1] as number) * scale);
    const cmb = fft(gaussianField(rng, n, 30), n);
    const data = fwhm.map((f, i) => {
      const noise = fft(gaussianField(rng, n, 0.3), n);
      const beamed = conv(sSpec, beam(f), tsz[i] as number);
      const cb = conv(cmb, beam(f), 1);
      return beamed.map((v, j) => v + (cb[j] as number) + (noise[j] as number));
    });
    const pure = fwhm.map((f, i) => conv(sSpec, beam(f), tsz[i] as number));
    const ratio = fwhm.map((f) => {
      const b = beam(f);
      return bEff.map((v, k) => v / (b[k] as number));
    });
    const input: HarmonicIlcInput = {
      layout,
      ellPerMode: ell,
      covarianceSpectra: data,
      synthesisSpectra: pure,
      beamRatio: ratio,
      constraints: [Float64Array.from(tsz)],
      windows: cosineEllWindows([2000, 5000], 0.5),
      maxBiasFraction: 1,
    };
    const out = harmonicIlc(input).spectrum;
    const expected = conv(sSpec, bEff, 1);
    expected[0] = 0;
    expected[1] = 0;
    expect(out).toAllClose(expected, { rtol: 1e-9, atol: 1e-9 });
  });

  it("cancels a fraction (m − 1)/N_p of the target, as Delabrouille et al. 2009 (A&A 493, 835) predict (simulation)", () => {
    // 16×16 maps: N_p = 255 real modes (ℓ = 0 left out), m = 4 bands ⇒ predicted 3/255 = 1.18 %.
    // Measured: 1 − Σ⟨ŷ, s⟩/Σ⟨s, s⟩ over 400 realisations. Expected scatter of the measurement:
    // sqrt(2(m−1))/N_p/sqrt(400) ≈ 0.05 % (projection part) plus residual noise × signal, ≈ 0.05 %.
    const m16 = 16;
    const p16 = getRfft2Plan(m16, m16);
    const ell16 = ells(p16.layout, PIX);
    let cross = 0;
    let auto = 0;
    let predicted = NaN;
    const rng = createRng(16);
    for (let r = 0; r < 400; r++) {
      const s = gaussianField(rng, m16, 1);
      const cmb = gaussianField(rng, m16, 30);
      const maps = bands(tsz, s, cmb, [0.05, 0.03, 0.04, 0.12], rng, m16);
      const spectra = maps.map((mp) => fft(mp, m16));
      const res = harmonicIlc({
        layout: p16.layout,
        ellPerMode: ell16,
        covarianceSpectra: spectra,
        synthesisSpectra: spectra,
        beamRatio: ones(p16.layout, 4),
        constraints: [Float64Array.from(tsz)],
        windows: cosineEllWindows([], 0.5),
        maxBiasFraction: 1,
      });
      predicted = (res.domains[0] as { biasFraction: number }).biasFraction;
      const sSpec = fft(s, m16);
      const notDc = (k: number) => (ell16[k] as number) > 0;
      cross += dotModes(res.spectrum, sSpec, p16.layout, notDc);
      auto += dotModes(sSpec, sSpec, p16.layout, notDc);
    }
    expect(predicted).toAllClose(3 / 255, { rtol: 1e-12 });
    const measured = 1 - cross / auto;
    expect(measured).toAllClose(predicted, { rtol: 0.15 }); // ≈ 3σ of the Monte Carlo scatter
  });
});
