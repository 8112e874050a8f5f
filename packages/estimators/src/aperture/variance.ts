/**
 * The variance of the aperture estimator from the map's noise power spectrum.
 *
 * The estimator is linear, Y_ap = Σ_p f_p y_p with the kernel f = ΔΩ (1_disc − (N_disc/N_ann) 1_ann)
 * (arcmin²). For a statistically homogeneous field on the periodic grid,
 *   Var(Y_ap) = (1/N) Σ_k |F_k|² S_k,  S_k = E|Ỹ_k|²/N = C(ℓ_k)/ΔΩ_sr,
 * with F the unnormalised DFT of f (FFT convention of @umbra/maps) and C(ℓ) the flat-sky power
 * (sr; the normalisation of @umbra/maps' crossPowerBinned). For white noise of per-pixel variance σ²
 * (C = σ²ΔΩ_sr) Parseval reduces it to σ² ΔΩ² (N_disc + N_disc²/N_ann) (common practice, no source).
 */
import { getRfft2Plan, type FlatGeometry } from "@umbra/maps";
import { RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import { checkApertureSpec, pixelAreaArcmin2, type ApertureSpec } from "./photometry.js";

/** A binned power spectrum: bin centres in ℓ and C_ℓ (sr × map unit²). NaN bins are ignored. */
export interface PowerTable {
  ellCenters: ArrayLike<number>;
  cl: ArrayLike<number>;
}

/** C(ℓ) by linear interpolation between finite bins, held constant beyond the end bins. */
export function interpolatePower(table: PowerTable): (ell: number) => number {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < table.ellCenters.length; i++) {
    const x = table.ellCenters[i] as number;
    const y = table.cl[i] as number;
    if (Number.isFinite(x) && Number.isFinite(y)) {
      xs.push(x);
      ys.push(y);
    }
  }
  if (xs.length === 0) throw new UmbraError("BAD_DATA", "noise power spectrum has no finite bin", { field: "noisePower" });
  return (ell: number): number => {
    if (ell <= (xs[0] as number)) return ys[0] as number;
    if (ell >= (xs[xs.length - 1] as number)) return ys[ys.length - 1] as number;
    let lo = 0;
    let hi = xs.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if ((xs[mid] as number) <= ell) lo = mid;
      else hi = mid;
    }
    const t = (ell - (xs[lo] as number)) / ((xs[hi] as number) - (xs[lo] as number));
    return (ys[lo] as number) * (1 - t) + (ys[hi] as number) * t;
  };
}

/**
 * The aperture kernel f (arcmin² per pixel) centred on pixel (0, 0) of the periodic grid, wrapped.
 * Same membership rule as apertureSum (pixel centres, integer centre), so it is the estimator's kernel.
 */
export function apertureKernel(geom: FlatGeometry, spec: ApertureSpec): Float64Array {
  checkApertureSpec(spec);
  const dxA = geom.dxRad / RAD_PER_ARCMIN;
  const dyA = geom.dyRad / RAD_PER_ARCMIN;
  const hx = Math.floor(spec.annulusOuterArcmin / dxA);
  const hy = Math.floor(spec.annulusOuterArcmin / dyA);
  if (2 * hx + 1 > geom.nx || 2 * hy + 1 > geom.ny) {
    throw new UmbraError("BAD_VALUE", `aperture of outer radius ${spec.annulusOuterArcmin} arcmin does not fit in the ${geom.nx}×${geom.ny} map`, { field: "aperture" });
  }
  const r2 = spec.radiusArcmin ** 2;
  const a2 = spec.annulusInnerArcmin ** 2;
  const b2 = spec.annulusOuterArcmin ** 2;
  let nDisc = 0;
  let nAnn = 0;
  for (let oy = -hy; oy <= hy; oy++) {
    for (let ox = -hx; ox <= hx; ox++) {
      const d2 = (ox * dxA) ** 2 + (oy * dyA) ** 2;
      if (d2 <= r2) nDisc++;
      if (d2 >= a2 && d2 <= b2) nAnn++;
    }
  }
  const area = pixelAreaArcmin2(geom);
  const ratio = nDisc / nAnn;
  const kernel = new Float64Array(geom.nx * geom.ny);
  for (let oy = -hy; oy <= hy; oy++) {
    const row = (((oy % geom.ny) + geom.ny) % geom.ny) * geom.nx;
    for (let ox = -hx; ox <= hx; ox++) {
      const d2 = (ox * dxA) ** 2 + (oy * dyA) ** 2;
      let v = 0;
      if (d2 <= r2) v += area;
      if (d2 >= a2 && d2 <= b2) v -= area * ratio;
      if (v !== 0) kernel[row + (((ox % geom.nx) + geom.nx) % geom.nx)] = v;
    }
  }
  return kernel;
}

/**
 * Var(Y_ap) in arcmin⁴ from the map's power spectrum C(ℓ) (sr × y²), by the formula of the module
 * doc. `ellOfMode` gives ℓ for each stored mode of the grid's FFT layout (e.g. @umbra/maps'
 * ellOfModes).
 */
export function apertureVarianceFromPower(geom: FlatGeometry, spec: ApertureSpec, power: (ell: number) => number, ellPerMode: Float64Array): number {
  const plan = getRfft2Plan(geom.nx, geom.ny);
  const kernel = apertureKernel(geom, spec);
  const spectrum = new Float64Array(plan.layout.spectrumLength);
  plan.forward(kernel, spectrum);
  const n = geom.nx * geom.ny;
  const omega = geom.dxRad * geom.dyRad;
  let acc = 0;
  for (let k = 0; k < plan.layout.modeCount; k++) {
    const f2 = (spectrum[2 * k] as number) ** 2 + (spectrum[2 * k + 1] as number) ** 2;
    if (f2 === 0) continue;
    acc += (plan.layout.hermitianWeight[k] as number) * f2 * power(ellPerMode[k] as number);
  }
  return acc / (n * omega);
}
