import { describe, expect, it } from "vitest";
import { createRng, fwhmToSigma, isUmbraError, RAD_PER_ARCMIN } from "@umbra/core";
import { convolveMap, ellOfModes, gaussianRealisation, getRfft2Plan, type FlatGeometry } from "@umbra/maps";
import { componentResponse } from "@umbra/spectra";
import { applyYMapWeights, buildYMap, yMapNoisePower, type IlcBand } from "../src/ilc/index.js";
import { apertureSum, apertureVarianceFromPower, interpolatePower, pixelAreaArcmin2, randomApertureScatter } from "../src/aperture/index.js";

// Invented survey for a simulation: 4 delta bands, 0.5′ pixels, 256² (128′ × 128′).
const N = 256;
const PIX_ARCMIN = 0.5;
const geom: FlatGeometry = { nx: N, ny: N, dxRad: PIX_ARCMIN * RAD_PER_ARCMIN, dyRad: PIX_ARCMIN * RAD_PER_ARCMIN };
const FREQ = [90, 150, 220, 350];
const FWHM = [2.2, 1.4, 1.0, 0.9];
const DEPTH_UK_ARCMIN = [15, 10, 25, 80];
const gaussB = (fwhm: number) => (ell: Float64Array) => {
  const s = fwhmToSigma(fwhm) * RAD_PER_ARCMIN;
  return ell.map((l) => Math.exp(-0.5 * l * l * s * s));
};
// toy CMB spectrum (invented shape, K² sr): D_ℓ ≈ 3000 µK² plateau damped above ℓ ≈ 2000
const cmbCl = (l: number) => (l > 0 ? ((2 * Math.PI * 3e-9) / (l * l + 1e4)) * Math.exp(-((l / 2000) ** 2)) : 0);

interface Cluster {
  x: number;
  y: number;
  y0: number;
  sigmaArcmin: number;
}

function simulate(seed: number) {
  const rng = createRng(seed);
  const ell = ellOfModes(getRfft2Plan(N, N).layout, geom);
  const cmb = gaussianRealisation(cmbCl, geom, rng.fork("cmb"));
  const clusters: Cluster[] = [];
  const crng = rng.fork("clusters");
  for (let i = 0; i < 5; i++) for (let j = 0; j < 5; j++) {
    clusters.push({ x: 32 + 48 * i + 8 * (crng.uniform() - 0.5), y: 32 + 48 * j + 8 * (crng.uniform() - 0.5), y0: 5e-5 * (1 + 2 * crng.uniform()), sigmaArcmin: 0.8 + 0.6 * crng.uniform() });
  }
  const ymap = new Float64Array(N * N);
  for (const c of clusters) {
    for (let iy = 0; iy < N; iy++) for (let ix = 0; ix < N; ix++) {
      const r2 = (((ix - c.x) * PIX_ARCMIN) ** 2 + ((iy - c.y) * PIX_ARCMIN) ** 2) / c.sigmaArcmin ** 2;
      if (r2 < 60) ymap[iy * N + ix] = (ymap[iy * N + ix] as number) + c.y0 * Math.exp(-0.5 * r2);
    }
  }
  const bands: IlcBand[] = FREQ.map((f, i) => {
    const a = componentResponse({ kind: "tsz" }, { frequencyGHz: f }, "K_CMB");
    const sky = ymap.map((v, p) => a * v + (cmb[p] as number));
    const beamed = convolveMap(sky, gaussB(FWHM[i] as number)(ell), geom);
    const nrng = rng.fork(`noise${i}`);
    const sigmaPix = ((DEPTH_UK_ARCMIN[i] as number) * 1e-6) / PIX_ARCMIN;
    for (let p = 0; p < beamed.length; p++) beamed[p] = (beamed[p] as number) + sigmaPix * nrng.normal();
    return { name: `f${f}`, map: beamed, band: { frequencyGHz: f }, beamTransfer: gaussB(FWHM[i] as number), fwhmArcmin: FWHM[i] as number };
  });
  return { bands, clusters, cmb, ell };
}

describe("y maps by the ILC family (simulated 4-band field)", () => {
  const sim = simulate(2026);

  it("recovers injected cluster Y by aperture photometry without bias, with calibrated errors", () => {
    const out = buildYMap(sim.bands, geom, { ilc: "scale" });
    expect(out.effectiveFwhmArcmin).toBe(2.2);
    const spec = { radiusArcmin: 4, annulusInnerArcmin: 5, annulusOuterArcmin: 6.5 };
    const positions = sim.clusters.map((c) => ({ xPix: c.x, yPix: c.y }));
    const noise = yMapNoisePower(out, { positions, holeRadiusArcmin: 6.5 });
    const err = Math.sqrt(apertureVarianceFromPower(geom, spec, interpolatePower(noise), out.ellPerMode));
    // the analytic error agrees with the scatter of random apertures away from the clusters
    const emp = randomApertureScatter(out.y, geom, spec, createRng(7), { count: 300, avoid: positions, avoidRadiusArcmin: 13 });
    expect(emp.stdArcmin2).toAllClose(err, { rtol: 0.15 });
    // the unmasked power holds the clusters' power and would overstate the error
    const errAll = Math.sqrt(apertureVarianceFromPower(geom, spec, interpolatePower(out.noisePower), out.ellPerMode));
    expect(errAll > 1.5 * err).toBe(true);
    const sb = fwhmToSigma(2.2);
    const pulls: number[] = [];
    const ratios: number[] = [];
    for (const c of sim.clusters) {
      const r = apertureSum(out.y, geom, c.x, c.y, spec);
      // expected aperture Y of a Gaussian (σ² = σ_c² + σ_beam²): Y·[(1 − e^{−R²/2s²}) − (N_d/N_a)(e^{−Rin²/2s²} − e^{−Rout²/2s²})]
      const s2 = c.sigmaArcmin ** 2 + sb * sb;
      const frac = 1 - Math.exp(-16 / (2 * s2)) - (r.discPixels / r.annulusPixels) * (Math.exp(-25 / (2 * s2)) - Math.exp(-(6.5 ** 2) / (2 * s2)));
      const yTrue = 2 * Math.PI * c.sigmaArcmin ** 2 * c.y0 * frac;
      pulls.push((r.yArcmin2 - yTrue) / err);
      ratios.push(r.yArcmin2 / yTrue);
    }
    const mean = pulls.reduce((s, v) => s + v, 0) / pulls.length;
    const sd = Math.sqrt(pulls.reduce((s, v) => s + (v - mean) ** 2, 0) / (pulls.length - 1));
    // 25 clusters: the mean pull has standard error 0.2; allow 3σ. The pull spread has standard error ≈ 0.14.
    expect(Math.abs(mean) < 0.6).toBe(true);
    expect(sd > 0.6 && sd < 1.4).toBe(true);
    // the pixelised Gaussian sum differs from the integral by far less than the noise (S/N ≈ 10–30 here)
    const med = [...ratios].sort((a, b) => a - b)[12] as number;
    expect(med).toAllClose(1, { atol: 0.05 });
    expect(out.biasWithinLimit).toBe(true);
    expect(pixelAreaArcmin2(geom)).toAllClose(0.25, { rtol: 1e-12 });
  });

  it("gives unit tSZ response in every domain and zero CMB response when the CMB is deprojected", () => {
    const out = buildYMap(sim.bands, geom, { ilc: "constrained", deproject: ["cmb"] });
    const tsz = out.constraints[0]?.response as number[];
    const cmb = out.constraints[1]?.response as number[];
    expect(cmb).toAllClose([1, 1, 1, 1], { rtol: 1e-12 }); // CMB in K_CMB is 1 (Fixsen 2009 units; definition)
    for (const d of out.domains) {
      expect(d.weights.reduce((s, w, i) => s + w * (tsz[i] as number), 0)).toAllClose(1, { rtol: 1e-10 });
      expect(d.weights.reduce((s, w) => s + w, 0)).toAllClose(0, { atol: 1e-10 * Math.max(...d.weights.map(Math.abs)) });
    }
  });

  it("suppresses the CMB residual to round-off with deprojection, unlike the standard ILC", () => {
    // Apply each ILC's own data-derived weights to maps holding only the beam-convolved CMB: the
    // residual is the CMB leaking into the y map (linearity of the combination).
    const cmbOnly = sim.bands.map((b, i) => ({ ...b, map: convolveMap(sim.cmb, gaussB(FWHM[i] as number)(sim.ell), geom) }));
    const rms = (a: Float64Array): number => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);
    const std = buildYMap(sim.bands, geom, { ilc: "standard" });
    const con = buildYMap(sim.bands, geom, { ilc: "constrained", deproject: ["cmb"] });
    const cmbRms = rms(sim.cmb); // K
    const leakStd = rms(applyYMapWeights(std, cmbOnly)) ; // y
    const leakCon = rms(applyYMapWeights(con, cmbOnly));
    // y per K of CMB: exact zero response up to round-off (Remazeilles et al. 2011, eq. 18 constraint)
    expect(leakCon / cmbRms).toAllClose(0, { atol: 1e-12 });
    expect(leakStd / cmbRms > 1e-9).toBe(true);
    expect(std.domains.length).toBe(1);
    expect(con.deprojected).toEqual(["cmb"]);
    // applying a product's weights to its own inputs reproduces its y map
    const again = applyYMapWeights(std, sim.bands);
    expect(again).toAllClose(std.y, { rtol: 0, atol: 1e-12 * Math.max(...std.y.map(Math.abs)) });
  });

  it("masks and inpaints a bright point source: NaN under the mask, clusters elsewhere unchanged within their errors", () => {
    // a 5 mK (peak) compact source at 220 and 350 GHz, 20′ from any cluster (invented)
    const src = { x: 56, y: 200 };
    const withSource = sim.bands.map((b, i) => {
      const amp = i >= 2 ? 5e-3 : 0;
      const s = (FWHM[i] as number) / Math.sqrt(8 * Math.LN2) / PIX_ARCMIN;
      const map = b.map.map((v, p) => v + amp * Math.exp(-0.5 * (((p % N) - src.x) ** 2 + (Math.floor(p / N) - src.y) ** 2) / (s * s)));
      const mask = new Uint8Array(N * N).fill(1);
      for (let p = 0; p < mask.length; p++) if (((p % N) - src.x) ** 2 + (Math.floor(p / N) - src.y) ** 2 <= 8 * 8) mask[p] = 0; // 4′ radius
      return { ...b, map, mask };
    });
    const clean = buildYMap(sim.bands, geom, { ilc: "scale" });
    const masked = buildYMap(withSource, geom, { ilc: "scale" });
    expect(Number.isNaN(masked.y[src.y * N + src.x] as number)).toBe(true);
    const spec = { radiusArcmin: 4, annulusInnerArcmin: 5, annulusOuterArcmin: 6.5 };
    const noise = yMapNoisePower(clean, { positions: sim.clusters.map((c) => ({ xPix: c.x, yPix: c.y })), holeRadiusArcmin: 6.5 });
    const err = Math.sqrt(apertureVarianceFromPower(geom, spec, interpolatePower(noise), clean.ellPerMode));
    let worst = 0;
    for (const c of sim.clusters) {
      const a = apertureSum(clean.y, geom, c.x, c.y, spec);
      const b = apertureSum(masked.y, geom, c.x, c.y, spec);
      if (b.flags.length > 0) continue;
      worst = Math.max(worst, Math.abs(a.yArcmin2 - b.yArcmin2) / err);
    }
    expect(worst < 0.5).toBe(true); // measured 0.02σ; without the mask the source shifts them by more than 0.5σ
  });

  it("rejects too few bands, mismatched grids and impossible constraints with typed errors", () => {
    const b = sim.bands;
    const codeOf = (f: () => unknown): string => {
      try {
        f();
        return "none";
      } catch (e) {
        return isUmbraError(e) ? e.code : "other";
      }
    };
    expect(codeOf(() => buildYMap(b.slice(0, 1), geom))).toBe("BAD_DATA");
    expect(codeOf(() => buildYMap([b[0] as IlcBand, { ...(b[1] as IlcBand), map: new Float64Array(10) }], geom))).toBe("BAD_DATA");
    expect(codeOf(() => buildYMap(b.slice(0, 2), geom, { ilc: "constrained", deproject: ["cmb", "dust"] }))).toBe("BAD_DATA");
    expect(codeOf(() => buildYMap(b, geom, { ilc: "constrained", deproject: [] }))).toBe("BAD_OPTION");
  });
});
