/**
 * An invented multi-band field for photometry tests: CMB-like correlated sky (same in every band
 * in K_CMB, beam-convolved), white noise per band, Gaussian-profile clusters painted in real space
 * (analytic beam convolution, independent of the Fourier code under test). Invented ids only.
 */
import { createRng, type Rng } from "@umbra/core";
import { convolveMap, ellOfModes, gaussianRealisation, getRfft2Plan, type Wcs } from "@umbra/maps";
import type { BandStack, StackBand } from "../src/stack/types.js";
import { RAD_PER_ARCMIN, gaussianBeam } from "./mmf-helpers.js";

export interface FieldCluster {
  id: string;
  px: number;
  py: number;
  sigmaArcmin: number;
  y0: number;
}

export interface FieldBand {
  name: string;
  frequencyGHz: number;
  fwhmArcmin: number;
  noiseUkArcmin: number;
  /** tSZ response K_CMB per unit y (given by the test so the field does not depend on @umbra/spectra). */
  tszKPerY: number;
}

export function tanWcs(nx: number, ny: number, pixArcmin: number): Wcs {
  return {
    ctype: ["RA---TAN", "DEC--TAN"],
    projection: "TAN",
    lonAxis: 0,
    crpix: [nx / 2 + 0.5, ny / 2 + 0.5],
    crval: [150, 2],
    cd: [-pixArcmin / 60, 0, 0, pixArcmin / 60],
    lonpole: 180,
    latpole: 2,
    pv: {},
    radesys: "ICRS",
    equinox: null,
  };
}

/** CMB-like C_ell in K² sr: flat D_ell = 2500 µK² with a damping tail (invented, for tests). */
export const cmbLikeCl = (ell: number): number => (ell < 2 ? 0 : ((2 * Math.PI * 2500e-12) / (ell * (ell + 1))) * Math.exp(-((ell / 2000) ** 2)));

export function makeField(n: number, pixArcmin: number, bands: FieldBand[], clusters: FieldCluster[], seed: number, opts: { cmb?: boolean } = {}): BandStack {
  const rng: Rng = createRng(seed);
  const geometry = { nx: n, ny: n, dxRad: pixArcmin * RAD_PER_ARCMIN, dyRad: pixArcmin * RAD_PER_ARCMIN };
  const plan = getRfft2Plan(n, n);
  const ells = ellOfModes(plan.layout, geometry);
  const cmb = opts.cmb === false ? new Float64Array(n * n) : gaussianRealisation(cmbLikeCl, geometry, rng.fork("cmb"));
  const stackBands: StackBand[] = bands.map((b, i) => {
    const beam = gaussianBeam(b.fwhmArcmin);
    const data = convolveMap(cmb, beam(ells), geometry);
    const sb = (b.fwhmArcmin / Math.sqrt(8 * Math.LN2)) ** 2;
    for (const c of clusters) {
      const s2 = c.sigmaArcmin ** 2 + sb;
      const amp = b.tszKPerY * c.y0 * (c.sigmaArcmin ** 2 / s2);
      const r = Math.ceil(6 * Math.sqrt(s2) / pixArcmin);
      for (let y = Math.max(0, Math.floor(c.py - r)); y <= Math.min(n - 1, Math.ceil(c.py + r)); y++) {
        for (let x = Math.max(0, Math.floor(c.px - r)); x <= Math.min(n - 1, Math.ceil(c.px + r)); x++) {
          const d2 = ((x - c.px) ** 2 + (y - c.py) ** 2) * pixArcmin * pixArcmin;
          data[y * n + x] += amp * Math.exp(-d2 / (2 * s2));
        }
      }
    }
    const sigmaPix = (b.noiseUkArcmin * 1e-6) / pixArcmin;
    const noise = rng.fork(`noise-${i}`);
    for (let p = 0; p < n * n; p++) data[p] += sigmaPix * noise.normal();
    return { name: b.name, spectral: { frequencyGHz: b.frequencyGHz }, beam, beamFwhmArcmin: b.fwhmArcmin, data, ivar: null, mask: null };
  });
  return { nx: n, ny: n, geometry, wcs: tanWcs(n, n, pixArcmin), bands: stackBands, warnings: [], inputs: [] };
}

/** tSZ K_CMB per unit y at a delta band, T0 (x coth(x/2) − 4) with T0 = 2.7255 K (Fixsen 2009) — used only to make invented data. */
export function tszNonRel(frequencyGHz: number): number {
  const x = (6.62607015e-34 * frequencyGHz * 1e9) / (1.380649e-23 * 2.7255);
  return 2.7255 * (x / Math.tanh(x / 2) - 4);
}

export const BANDS3: FieldBand[] = [
  { name: "f090", frequencyGHz: 90, fwhmArcmin: 2.2, noiseUkArcmin: 12, tszKPerY: tszNonRel(90) },
  { name: "f150", frequencyGHz: 150, fwhmArcmin: 1.4, noiseUkArcmin: 10, tszKPerY: tszNonRel(150) },
  { name: "f220", frequencyGHz: 220, fwhmArcmin: 1.0, noiseUkArcmin: 35, tszKPerY: tszNonRel(220) },
];
