import { describe, expect, it } from "vitest";
import { createRng } from "@umbra/core";
import { buildFilterBank } from "../src/mmf/bank.js";
import { fitAtPosition } from "../src/mmf/fit.js";
import { filterSigma, filteredMap, prepareSedFilter } from "../src/mmf/filteredMap.js";
import { gaussianShape, tabulateProfile } from "../src/mmf/profile.js";
import { RAD_PER_ARCMIN, gaussianBeam, paintTemplate, setup, whiteCovariance, whiteNoiseSpectra } from "./mmf-helpers.js";

/**
 * Closed form (derived in docs/matched-filter.md; common practice, no source): one band, white
 * noise of per-pixel variance σ_pix², Gaussian beam σ_b, Gaussian profile σ_c, SED f. The template
 * is f·A·exp(−θ²/2s²) with s² = σ_c² + σ_b², A = σ_c²/s², so the matched filter variance is
 *   σ_y² = σ_pix² Ω_pix / (π f² A² s²).
 */
function closedFormSigma(sigmaPix: number, pixSr: number, f: number, sigC: number, sigB: number): number {
  const s2 = sigC * sigC + sigB * sigB;
  const A = (sigC * sigC) / s2;
  return Math.sqrt((sigmaPix * sigmaPix * pixSr) / (Math.PI * f * f * A * A * s2));
}

describe("matched filter against a closed form", () => {
  const s = setup(128, 0.5);
  const sigC = 2 * RAD_PER_ARCMIN;
  const fwhmB = 2.0;
  const sigB = (fwhmB * RAD_PER_ARCMIN) / Math.sqrt(8 * Math.LN2);
  const table = tabulateProfile(gaussianShape(1), 200000 * sigC);
  const pixSr = s.geom.dxRad * s.geom.dyRad;

  it("gives the closed-form variance for one band, white noise, Gaussian beam and profile", () => {
    const sigmaPix = 3e-5;
    const f = -2.5; // K_CMB per unit y (any constant)
    const bank = buildFilterBank({
      layout: s.layout, geometry: s.geom, ells: s.ells,
      spectra: [new Float64Array(s.layout.spectrumLength)],
      beams: [gaussianBeam(fwhmB)],
      covariance: whiteCovariance([[sigmaPix ** 2]], s.geom, [gaussianBeam(fwhmB)]),
    });
    const sig = filterSigma(bank, table, sigC, prepareSedFilter(bank, Float64Array.of(f)));
    expect(sig).toAllClose(closedFormSigma(sigmaPix, pixSr, f, sigC, sigB), { rtol: 1e-5 });
  });

  it("combines two bands with independent white noise as inverse-variance weighting", () => {
    // σ⁻² = Σ_i σ_i⁻² for independent channels with the same beam (closed form, common practice)
    const noise = [2e-5, 5e-5];
    const f = [-3, 1.5];
    const bank = buildFilterBank({
      layout: s.layout, geometry: s.geom, ells: s.ells,
      spectra: [new Float64Array(s.layout.spectrumLength), new Float64Array(s.layout.spectrumLength)],
      beams: [gaussianBeam(fwhmB), gaussianBeam(fwhmB)],
      covariance: whiteCovariance([[noise[0]! ** 2, 0], [0, noise[1]! ** 2]], s.geom, [gaussianBeam(fwhmB), gaussianBeam(fwhmB)]),
    });
    const sig = filterSigma(bank, table, sigC, prepareSedFilter(bank, Float64Array.from(f)));
    const s1 = closedFormSigma(noise[0]!, pixSr, f[0]!, sigC, sigB);
    const s2 = closedFormSigma(noise[1]!, pixSr, f[1]!, sigC, sigB);
    expect(sig).toAllClose(1 / Math.sqrt(1 / s1 ** 2 + 1 / s2 ** 2), { rtol: 1e-5 });
  });

  it("recovers an injected noiseless template at a fractional pixel position with correlated noise weights", () => {
    const beams = [gaussianBeam(2.0), gaussianBeam(1.4), gaussianBeam(1.0)];
    const sed = [-4.1, -1.2, 3.3];
    const spectra = [0, 1, 2].map(() => new Float64Array(s.layout.spectrumLength));
    paintTemplate(s, spectra, table, sigC, sed, beams, 1.7e-4, 40.3, 71.8);
    const bank = buildFilterBank({
      layout: s.layout, geometry: s.geom, ells: s.ells, spectra, beams,
      covariance: whiteCovariance([[4, 1, 0.5], [1, 3, 1], [0.5, 1, 2]].map((r) => r.map((v) => v * 1e-10)), s.geom, beams),
    });
    const fit = fitAtPosition(bank, table, sigC, [Float64Array.from(sed)], 40.3, 71.8);
    expect(fit.amplitudes[0]).toAllClose(1.7e-4, { rtol: 1e-5 });
    // the map version agrees with the point fit at a pixel centre
    const spectra2 = [0, 1, 2].map(() => new Float64Array(s.layout.spectrumLength));
    paintTemplate(s, spectra2, table, sigC, sed, beams, 1.7e-4, 40, 71);
    const bank2 = buildFilterBank({ layout: s.layout, geometry: s.geom, ells: s.ells, beams, covariance: bank.covariance, spectra: spectra2 });
    const out = new Float64Array(128 * 128);
    const sig = filteredMap(bank2, s.plan, table, sigC, prepareSedFilter(bank2, Float64Array.from(sed)), out);
    expect(out[71 * 128 + 40]).toAllClose(1.7e-4, { rtol: 1e-5 });
    expect(sig).toAllClose(Math.sqrt(fit.covariance[0]!), { rtol: 1e-10 });
  });

  it("has zero response to a deprojected SED and still recovers the cluster", () => {
    const beams = [gaussianBeam(2.0), gaussianBeam(1.4), gaussianBeam(1.0)];
    const sed = [-4.1, -1.2, 3.3];
    const cmb = [1, 1, 1];
    const spectra = [0, 1, 2].map(() => new Float64Array(s.layout.spectrumLength));
    // a CMB-SED blob with another profile size at the same place, much brighter than the cluster
    paintTemplate(s, spectra, table, 3 * sigC, cmb, beams, 5e-3, 64, 64);
    paintTemplate(s, spectra, table, sigC, sed, beams, 1e-4, 64, 64);
    const cov = whiteCovariance([[4, 1, 0.5], [1, 3, 1], [0.5, 1, 2]].map((r) => r.map((v) => v * 1e-10)), s.geom, beams);
    const bank = buildFilterBank({ layout: s.layout, geometry: s.geom, ells: s.ells, spectra, beams, covariance: cov, deproject: [Float64Array.from(cmb)] });
    const fit = fitAtPosition(bank, table, sigC, [Float64Array.from(sed)], 64, 64);
    // leak of the 50× brighter blob: node interpolation (measured 4e-5 of the cluster, < 1e-6 of the blob)
    expect(fit.amplitudes[0]).toAllClose(1e-4, { rtol: 1e-4 });
    const plain = buildFilterBank({ layout: s.layout, geometry: s.geom, ells: s.ells, spectra, beams, covariance: cov });
    const fitPlain = fitAtPosition(plain, table, sigC, [Float64Array.from(sed)], 64, 64);
    expect(Math.abs(fitPlain.amplitudes[0]! - 1e-4)).toBeGreaterThan(1e-5); // without deprojection the blob leaks in
    expect(fit.covariance[0]!).toBeGreaterThan(fitPlain.covariance[0]!); // the constraint costs variance
  });

  it("fits tSZ and a second SED jointly and returns their covariance", () => {
    const beams = [gaussianBeam(2.0), gaussianBeam(1.4), gaussianBeam(1.0)];
    const tsz = Float64Array.of(-4.1, -1.2, 3.3);
    const ksz = Float64Array.of(2.7, 2.7, 2.7);
    const spectra = [0, 1, 2].map(() => new Float64Array(s.layout.spectrumLength));
    paintTemplate(s, spectra, table, sigC, [...tsz], beams, 1e-4, 50, 60);
    paintTemplate(s, spectra, table, sigC, [...ksz], beams, -3e-5, 50, 60);
    const cov = whiteCovariance([[4, 0, 0], [0, 3, 0], [0, 0, 2]].map((r) => r.map((v) => v * 1e-10)), s.geom, beams);
    const bank = buildFilterBank({ layout: s.layout, geometry: s.geom, ells: s.ells, spectra, beams, covariance: cov });
    const fit = fitAtPosition(bank, table, sigC, [tsz, ksz], 50, 60);
    expect(fit.amplitudes).toAllClose([1e-4, -3e-5], { rtol: 1e-5 });
    expect(fit.covariance[1]).toAllClose(fit.covariance[2]!, { rtol: 1e-12 });
  });

  it("has an analytic error that matches the scatter over noise realisations", () => {
    const small = setup(64, 0.5);
    const beams = [gaussianBeam(2.0), gaussianBeam(1.0)];
    const sed = Float64Array.of(-3, 2);
    const chol = [[2e-5, 0], [1e-5, 1.5e-5]];
    const pixCov = [[4e-10, 2e-10], [2e-10, 1e-10 + 2.25e-10]];
    const rng = createRng(7);
    const est: number[] = [];
    let sigma = 0;
    const cov = whiteCovariance(pixCov, small.geom, beams, 31000, 8);
    for (let r = 0; r < 300; r++) {
      const spectra = whiteNoiseSpectra(small, chol, rng);
      const bank = buildFilterBank({ layout: small.layout, geometry: small.geom, ells: small.ells, spectra, beams, covariance: cov });
      const fit = fitAtPosition(bank, table, sigC, [sed], 31.5, 20.25);
      est.push(fit.amplitudes[0]!);
      sigma = Math.sqrt(fit.covariance[0]!);
    }
    const mean = est.reduce((a, b) => a + b, 0) / est.length;
    const sd = Math.sqrt(est.reduce((a, b) => a + (b - mean) ** 2, 0) / (est.length - 1));
    // 300 draws: the sample sd has a relative standard error of 1/sqrt(2·299) ≈ 4 %; allow 3σ
    expect(sd).toAllClose(sigma, { rtol: 0.12 });
    expect(Math.abs(mean)).toBeLessThan((4 * sigma) / Math.sqrt(est.length));
  });
});
