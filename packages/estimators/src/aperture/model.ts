/**
 * The beam-convolved cluster template on a small periodic grid around an aperture: its aperture
 * response, and painting the template into a map (to subtract a
 * first-pass fit of every cluster before the noise and the random apertures are measured).
 *
 * Template spectrum in DFT units (normalisation of @umbra/maps' FFT), unit central y:
 *   T_k = θ² g(ℓ_k θ) B_eff(ℓ_k) / ΔΩ,
 * with g the profile's Fourier transform at unit scale (../mmf/profile.ts), θ = θ500 in rad,
 * B_eff(ℓ) = exp(−ℓ(ℓ+1)σ²/2) the y map's Gaussian beam (@umbra/maps gaussianBeam) and ΔΩ the pixel solid angle (sr): the DFT of
 * the pixel-sampled continuous image whose transform is τ̃ B (common practice, no source).
 * Aperture response Y_ap = (1/N) Σ_k w_k Re(F_k conj T_k), with F the kernel's DFT. (The noise
 * variance is not taken from this grid: it misses the map's largest scales; see radial.ts.)
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
  /** Template spectrum T_k on the local grid (real, one value per stored mode), with the effective beam. */
  template: Float64Array;
  /** The same without the beam: θ² g(ℓθ)/ΔΩ (the unconvolved profile, for per-band models). */
  profileSpectrum: Float64Array;
}

/**
 * Local grid side for an aperture and a template of scale θ500 (arcmin) with a beam of FWHM eff
 * (arcmin): it must hold the template (radius 5 θ500 + 3 FWHM) on both sides of the centre, and the
 * template's periodic copy must stay out of the aperture (side ≥ R_out + 5 θ500 + 3 FWHM).
 */
function localSide(spec: ApertureSpec, thetaArcmin: number, effFwhmArcmin: number, geom: FlatGeometry): number {
  const pixArcmin = Math.min(geom.dxRad, geom.dyRad) / RAD_PER_ARCMIN;
  const extent = 5 * thetaArcmin + 3 * effFwhmArcmin;
  return smoothAtLeast((Math.max(2 * extent, spec.annulusOuterArcmin + extent) + 4 * pixArcmin) / pixArcmin);
}

/** Template response of one aperture and the template spectrum (see module doc). */
export function apertureModel(spec: ApertureSpec, thetaArcmin: number, table: ProfileTable, effFwhmArcmin: number, geom: FlatGeometry): ApertureModel {
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
  const profileSpectrum = new Float64Array(plan.layout.modeCount);
  let resp = 0;
  for (let k = 0; k < plan.layout.modeCount; k++) {
    const l = ell[k] as number;
    const w = plan.layout.hermitianWeight[k] as number;
    const re = fk[2 * k] as number;
    const p = (thetaRad * thetaRad * profileAt(table, l * thetaRad)) / omega;
    const t = p * (beam[k] as number);
    profileSpectrum[k] = p;
    template[k] = t;
    resp += w * re * t;
  }
  const npix = n * n;
  return { spec, side: n, responseArcmin2: resp / npix, template, profileSpectrum };
}

/** The local image (n × n, centred on pixel (0, 0), wrapped) of the template shifted by (fx, fy) pixels. */
function shiftedImage(model: ApertureModel, fx: number, fy: number, withBeam: boolean): Float64Array {
  const n = model.side;
  const plan = getRfft2Plan(n, n);
  const shape = withBeam ? model.template : model.profileSpectrum;
  const spec = new Float64Array(plan.layout.spectrumLength);
  for (let k = 0; k < plan.layout.modeCount; k++) {
    const phase = (-2 * Math.PI * ((plan.layout.kxIndex[k] as number) * fx + (plan.layout.kyIndex[k] as number) * fy)) / n;
    const t = shape[k] as number;
    spec[2 * k] = t * Math.cos(phase);
    spec[2 * k + 1] = t * Math.sin(phase);
  }
  const img = new Float64Array(n * n);
  plan.inverse(spec, img);
  return img;
}

/**
 * The aperture response (arcmin², y0 = 1) for a cluster at the sub-pixel offset (fx, fy) from the
 * nearest pixel: the template is shifted by a phase factor and the aperture's pixel membership is
 * taken about the same sub-pixel centre, as apertureSum does on the map. This removes the ≈1 %
 * pixelisation scatter of the integer-centred response.
 */
export function responseAt(model: ApertureModel, geom: FlatGeometry, fx: number, fy: number): number {
  const n = model.side;
  const img = shiftedImage(model, fx, fy, true);
  const dxA = geom.dxRad / RAD_PER_ARCMIN;
  const dyA = geom.dyRad / RAD_PER_ARCMIN;
  const { radiusArcmin: r, annulusInnerArcmin: ri, annulusOuterArcmin: ro } = model.spec;
  const h = Math.floor(n / 2);
  let disc = 0;
  let nd = 0;
  let ann = 0;
  let na = 0;
  for (let oy = -h; oy < n - h; oy++) {
    const dy = (oy - fy) * dyA;
    const ly = ((oy % n) + n) % n;
    for (let ox = -h; ox < n - h; ox++) {
      const dx = (ox - fx) * dxA;
      const d2 = dx * dx + dy * dy;
      const v = img[ly * n + (((ox % n) + n) % n)] as number;
      if (d2 <= r * r) {
        disc += v;
        nd++;
      }
      if (d2 >= ri * ri && d2 <= ro * ro) {
        ann += v;
        na++;
      }
    }
  }
  return dxA * dyA * (disc - (nd * ann) / na);
}

/**
 * Add amplitude × template (with the effective beam, or without any beam when `withBeam` is false)
 * centred at the sub-pixel position (px, py) into `map` (in place). The
 * sub-pixel shift is a phase factor on the local grid's spectrum (exact for a band-limited image);
 * the local image is then added around the nearest pixel, clipped at the map's border.
 */
export function paintTemplate(map: Float64Array, geom: FlatGeometry, model: ApertureModel, amplitude: number, px: number, py: number, withBeam = true): void {
  const n = model.side;
  const cx = Math.round(px);
  const cy = Math.round(py);
  const img = shiftedImage(model, px - cx, py - cy, withBeam);
  const h = Math.floor(n / 2);
  for (let oy = -h; oy < n - h; oy++) {
    const y = cy + oy;
    if (y < 0 || y >= geom.ny) continue;
    const ly = ((oy % n) + n) % n;
    for (let ox = -h; ox < n - h; ox++) {
      const x = cx + ox;
      if (x < 0 || x >= geom.nx) continue;
      const p = y * geom.nx + x;
      map[p] = (map[p] as number) + amplitude * (img[ly * n + (((ox % n) + n) % n)] as number);
    }
  }
}
