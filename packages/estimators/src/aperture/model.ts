/**
 * The beam-convolved cluster template on a small periodic grid around an aperture: its aperture
 * response, the aperture's noise variance, and painting the template into a map (to subtract a
 * first-pass fit of every cluster before the noise and the random apertures are measured).
 *
 * Template spectrum in DFT units (normalisation of @umbra/maps' FFT), unit central y:
 *   T_k = θ² g(ℓ_k θ) B_eff(ℓ_k) / ΔΩ,
 * with g the profile's Fourier transform at unit scale (../mmf/profile.ts), θ = θ500 in rad,
 * B_eff(ℓ) = exp(−ℓ(ℓ+1)σ²/2) the y map's Gaussian beam (@umbra/maps gaussianBeam) and ΔΩ the pixel solid angle (sr): the DFT of
 * the pixel-sampled continuous image whose transform is τ̃ B (common practice, no source).
 * Aperture response Y_ap = (1/N) Σ_k w_k Re(F_k conj T_k) and variance
 * Var = (1/N) Σ_k w_k |F_k|² C(ℓ_k)/ΔΩ (aperture/variance.ts), with F the kernel's DFT.
 */
import { RAD_PER_ARCMIN } from "@umbra/core";
import { ellOfModes, gaussianBeam, getRfft2Plan, type FlatGeometry } from "@umbra/maps";
import { profileAt, type ProfileTable } from "../mmf/profile.js";
import type { ApertureSpec } from "./photometry.js";
import { apertureKernel } from "./variance.js";

/** Smallest 2^a 3^b 5^c ≥ n (an FFT-friendly grid side). */
export function smoothAtLeast(n: number): number {
  for (let m = Math.max(2, Math.ceil(n)); ; m++) {
    let r = m;
    for (const p of [2, 3, 5]) while (r % p === 0) r /= p;
    if (r === 1) return m;
  }
}

/** What the local grid gives for one aperture size. */
export interface ApertureModel {
  spec: ApertureSpec;
  /** Side of the local grid, pixels. */
  side: number;
  /** Aperture Y of the beam-convolved profile with y0 = 1, arcmin². */
  responseArcmin2: number;
  /** Var(Y_ap) from the noise power, arcmin⁴. */
  varianceArcmin4: number;
  /** Template spectrum T_k on the local grid (real, one value per stored mode). */
  template: Float64Array;
}

/** Local grid side for an aperture and a template of scale θ500 (arcmin) with a beam of FWHM eff (arcmin). */
function localSide(spec: ApertureSpec, thetaArcmin: number, effFwhmArcmin: number, geom: FlatGeometry): number {
  const pixArcmin = Math.min(geom.dxRad, geom.dyRad) / RAD_PER_ARCMIN;
  return smoothAtLeast((2 * (spec.annulusOuterArcmin + 5 * thetaArcmin + 3 * effFwhmArcmin)) / pixArcmin);
}

/** Template response and noise variance of one aperture (see module doc). */
export function apertureModel(spec: ApertureSpec, thetaArcmin: number, table: ProfileTable, effFwhmArcmin: number, geom: FlatGeometry, power: (ell: number) => number): ApertureModel {
  const n = localSide(spec, thetaArcmin, effFwhmArcmin, geom);
  const local: FlatGeometry = { nx: n, ny: n, dxRad: geom.dxRad, dyRad: geom.dyRad };
  const plan = getRfft2Plan(n, n);
  const fk = new Float64Array(plan.layout.spectrumLength);
  plan.forward(apertureKernel(local, spec), fk);
  const ell = ellOfModes(plan.layout, local);
  const omega = geom.dxRad * geom.dyRad;
  const thetaRad = thetaArcmin * RAD_PER_ARCMIN;
  const beam = gaussianBeam(effFwhmArcmin).transferOnEll(ell);
  const template = new Float64Array(plan.layout.modeCount);
  let resp = 0;
  let vari = 0;
  for (let k = 0; k < plan.layout.modeCount; k++) {
    const l = ell[k] as number;
    const w = plan.layout.hermitianWeight[k] as number;
    const re = fk[2 * k] as number;
    const im = fk[2 * k + 1] as number;
    const t = (thetaRad * thetaRad * profileAt(table, l * thetaRad) * (beam[k] as number)) / omega;
    template[k] = t;
    resp += w * re * t;
    vari += w * (re * re + im * im) * power(l);
  }
  const npix = n * n;
  return { spec, side: n, responseArcmin2: resp / npix, varianceArcmin4: vari / (npix * omega), template };
}

/**
 * Add amplitude × template centred at the sub-pixel position (px, py) into `map` (in place). The
 * sub-pixel shift is a phase factor on the local grid's spectrum (exact for a band-limited image);
 * the local image is then added around the nearest pixel, clipped at the map's border.
 */
export function paintTemplate(map: Float64Array, geom: FlatGeometry, model: ApertureModel, amplitude: number, px: number, py: number): void {
  const n = model.side;
  const plan = getRfft2Plan(n, n);
  const cx = Math.round(px);
  const cy = Math.round(py);
  const fx = px - cx;
  const fy = py - cy;
  const spec = new Float64Array(plan.layout.spectrumLength);
  for (let k = 0; k < plan.layout.modeCount; k++) {
    const phase = (-2 * Math.PI * ((plan.layout.kxIndex[k] as number) * fx + (plan.layout.kyIndex[k] as number) * fy)) / n;
    const t = amplitude * (model.template[k] as number);
    spec[2 * k] = t * Math.cos(phase);
    spec[2 * k + 1] = t * Math.sin(phase);
  }
  const img = new Float64Array(n * n);
  plan.inverse(spec, img);
  const h = Math.floor(n / 2);
  for (let oy = -h; oy < n - h; oy++) {
    const y = cy + oy;
    if (y < 0 || y >= geom.ny) continue;
    const ly = ((oy % n) + n) % n;
    for (let ox = -h; ox < n - h; ox++) {
      const x = cx + ox;
      if (x < 0 || x >= geom.nx) continue;
      const p = y * geom.nx + x;
      map[p] = (map[p] as number) + (img[ly * n + (((ox % n) + n) % n)] as number);
    }
  }
}
