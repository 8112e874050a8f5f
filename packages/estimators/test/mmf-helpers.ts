/**
 * Small synthetic inputs for the matched-filter tests: Gaussian beams, constant (white) band
 * covariances, Fourier-painted cluster templates and white-noise spectra. Invented data only.
 */
import { createRng, type Rng } from "@umbra/core";
import { ellOfModes, getRfft2Plan, type FlatGeometry, type SpectrumLayout } from "@umbra/maps";
import type { BandCovariance } from "../src/noise/types.js";
import { profileAt, type ProfileTable } from "../src/mmf/profile.js";

export const RAD_PER_ARCMIN = Math.PI / (180 * 60);

/** Gaussian beam transfer B(ℓ) = exp(−ℓ²σ²/2) for a beam of the given FWHM (arcmin). */
export function gaussianBeam(fwhmArcmin: number): (ells: Float64Array) => Float64Array {
  const s = (fwhmArcmin * RAD_PER_ARCMIN) / Math.sqrt(8 * Math.LN2);
  return (ells) => ells.map((l) => Math.exp(-0.5 * l * l * s * s));
}

/**
 * The beam-deconvolved covariance C̃_ij(ℓ) = C_ij/(B_i B_j) (sr·K²) of white noise with per-pixel
 * covariance `pixelCov` (nb×nb) seen through `beams`, on bins `stepEll` wide up to `ellMax`.
 */
export function whiteCovariance(pixelCov: number[][], geom: FlatGeometry, beams: ((l: Float64Array) => Float64Array)[], ellMax = 40000, stepEll = 2): BandCovariance {
  const nb = pixelCov.length;
  const omega = geom.dxRad * geom.dyRad;
  const nBins = Math.ceil(ellMax / stepEll);
  const centres = new Float64Array(nBins);
  for (let k = 0; k < nBins; k++) centres[k] = (k + 0.5) * stepEll;
  const b = beams.map((f) => f(centres));
  const values = new Float64Array(nBins * nb * nb);
  for (let k = 0; k < nBins; k++) {
    for (let i = 0; i < nb; i++) {
      for (let j = 0; j < nb; j++) {
        const bb = (b[i]![k] as number) * (b[j]![k] as number);
        values[k * nb * nb + i * nb + j] = bb > 1e-280 ? ((pixelCov[i]?.[j] as number) * omega) / bb : i === j ? 1e200 : 0;
      }
    }
  }
  const edges = new Float64Array(nBins + 1);
  for (let k = 0; k <= nBins; k++) edges[k] = k * stepEll;
  return { nBands: nb, ellEdges: edges, ellCentres: centres, values, modeCounts: new Float64Array(nBins).fill(1), conditionNumbers: new Float64Array(nBins).fill(1), loading: new Float64Array(nBins) };
}

export interface Setup {
  geom: FlatGeometry;
  layout: SpectrumLayout;
  ells: Float64Array;
  plan: ReturnType<typeof getRfft2Plan>;
}

export function setup(n: number, pixArcmin: number): Setup {
  const geom = { nx: n, ny: n, dxRad: pixArcmin * RAD_PER_ARCMIN, dyRad: pixArcmin * RAD_PER_ARCMIN };
  const plan = getRfft2Plan(n, n);
  return { geom, layout: plan.layout, plan, ells: ellOfModes(plan.layout, geom) };
}

/** Add amp·sed_i·B_i(ℓ)·τ̃(ℓ)·e^{−2πik·x0}/Ω to each band spectrum (a template at fractional pixel x0). */
export function paintTemplate(
  s: Setup,
  spectra: Float64Array[],
  table: ProfileTable,
  thetaRad: number,
  sed: readonly number[],
  beams: ((l: Float64Array) => Float64Array)[],
  amp: number,
  px: number,
  py: number,
): void {
  const { layout, geom, ells } = s;
  const omega = geom.dxRad * geom.dyRad;
  spectra.forEach((spec, i) => {
    const b = (beams[i] as (l: Float64Array) => Float64Array)(ells);
    for (let m = 0; m < layout.modeCount; m++) {
      const g = profileAt(table, (ells[m] as number) * thetaRad) * thetaRad * thetaRad;
      const a = (-2 * Math.PI * ((layout.kxIndex[m] as number) * px)) / geom.nx - (2 * Math.PI * ((layout.kyIndex[m] as number) * py)) / geom.ny;
      const v = (amp * (sed[i] as number) * (b[m] as number) * g) / omega;
      spec[2 * m] += v * Math.cos(a);
      spec[2 * m + 1] += v * Math.sin(a);
    }
  });
}

/** Spectra of white noise maps with per-pixel covariance L Lᵀ (L lower-triangular Cholesky factor). */
export function whiteNoiseSpectra(s: Setup, chol: number[][], rng: Rng = createRng(1)): Float64Array[] {
  const nb = chol.length;
  const npix = s.geom.nx * s.geom.ny;
  const z = Array.from({ length: nb }, () => rng.fillNormal(new Float64Array(npix)) as Float64Array);
  return chol.map((row) => {
    const map = new Float64Array(npix);
    row.forEach((l, j) => {
      if (l !== 0) for (let p = 0; p < npix; p++) map[p] += l * (z[j]?.[p] as number);
    });
    const spec = new Float64Array(s.layout.spectrumLength);
    s.plan.forward(map, spec);
    return spec;
  });
}
