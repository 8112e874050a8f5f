/**
 * Gaussian random fields with a given angular power spectrum on the flat sky.
 *
 * Method: fill the map with unit white noise n (per-pixel variance 1), transform (N = FFT n, so
 * ⟨|N_k|²⟩ = nx·ny), multiply each mode by sqrt(C(ell_k)/ΔΩ) and transform back. With the
 * estimator of power.ts (P = ΔΩ/(nx·ny)·|F|²) the result has ⟨P(k)⟩ = C(ell_k); starting from real
 * white noise makes the spectrum Hermitian by construction. The mean (ell = 0 mode) is set to 0.
 * This is the standard flat-sky recipe (common practice, no single source).
 */
import { UmbraError, type Rng } from "@umbra/core";
import type { FlatGeometry } from "../types.js";
import { ellOfModes } from "./modes.js";
import { getRfft2Plan } from "./rfft2-f64.js";

/** An angular power spectrum C_ell (sr × unit²): a function of ell, or a table linearly interpolated in ell (0 outside). */
export type ClSpec = ((ell: number) => number) | { ell: Float64Array; cl: Float64Array };

/** Evaluate a {@link ClSpec} at `ell`: the function, or linear interpolation in the table (0 outside its range). */
export function evaluateCl(spec: ClSpec, ell: number): number {
  if (typeof spec === "function") return spec(ell);
  const xs = spec.ell;
  const ys = spec.cl;
  const n = xs.length;
  if (n === 0 || ell < (xs[0] as number) || ell > (xs[n - 1] as number)) return 0;
  let a = 0;
  let b = n - 1;
  while (b - a > 1) {
    const c = (a + b) >> 1;
    if (ell >= (xs[c] as number)) a = c;
    else b = c;
  }
  const x0 = xs[a] as number;
  const x1 = xs[b] as number;
  if (x1 === x0) return ys[a] as number;
  const t = (ell - x0) / (x1 - x0);
  return (1 - t) * (ys[a] as number) + t * (ys[b] as number);
}

function checkTable(spec: ClSpec): void {
  if (typeof spec === "function") return;
  if (spec.ell.length !== spec.cl.length || spec.ell.length < 2) {
    throw new UmbraError("BAD_VALUE", `C_ell table needs ≥ 2 points and equal lengths (ell ${spec.ell.length}, cl ${spec.cl.length})`, { field: "clEll" });
  }
  for (let i = 1; i < spec.ell.length; i++) {
    if (!((spec.ell[i] as number) > (spec.ell[i - 1] as number))) {
      throw new UmbraError("BAD_VALUE", `C_ell table ell values must increase strictly (index ${i})`, { field: "clEll", row: i });
    }
  }
}

/**
 * A zero-mean Gaussian random map (nx·ny values, row-major) whose flat-sky power spectrum is
 * C_ell (see module comment). Consumes exactly nx·ny normals from `rng`; same seed ⇒ same map.
 * Throws BAD_VALUE if C_ell is negative or not finite at any mode with ell > 0.
 */
export function gaussianRealisation(clEll: ClSpec, geom: FlatGeometry, rng: Rng): Float64Array {
  checkTable(clEll);
  const plan = getRfft2Plan(geom.nx, geom.ny);
  const layout = plan.layout;
  const ell = ellOfModes(layout, geom);
  const map = new Float64Array(geom.nx * geom.ny);
  rng.fillNormal(map);
  const spec = new Float64Array(layout.spectrumLength);
  plan.forward(map, spec);
  const invArea = 1 / (geom.dxRad * geom.dyRad);
  for (let m = 0; m < layout.modeCount; m++) {
    const l = ell[m] as number;
    let amp = 0;
    if (l > 0) {
      const c = evaluateCl(clEll, l);
      if (!(c >= 0) || !Number.isFinite(c)) {
        throw new UmbraError("BAD_VALUE", `C_ell(${l}) = ${c} must be finite and ≥ 0`, { field: "clEll", value: c });
      }
      amp = Math.sqrt(c * invArea);
    }
    spec[2 * m] = (spec[2 * m] as number) * amp;
    spec[2 * m + 1] = (spec[2 * m + 1] as number) * amp;
  }
  plan.inverse(spec, map);
  return map;
}
