/**
 * Builds the table behind the fast relativistic tSZ evaluator from the exact single-scattering
 * integral (Wright 1979, ApJ 232, 348; see tszRelativistic.ts). The table stores, on a uniform grid
 * in x = hν/k_BT0 (x = 0 … xMax), the Chebyshev coefficients in θe ∈ [0, θmax] of the relativistic
 * correction Q(x, θ) = (Y(x, θ) − Y0(x))/θ, where Y is ΔT/T0 per unit y and Y0 = x coth(x/2) − 4.
 * Chebyshev interpolation at Chebyshev–Gauss nodes: Press et al. 2007, Numerical Recipes 3rd ed., §5.8.
 */
import { thetaFromKeV } from "./constants.js";
import { tszShape } from "./tsz.js";
import { tszRelativisticShapeExact } from "./tszRelativistic.js";
import type { RelativisticQuadrature } from "./tszRelativistic.js";

/** The fast evaluator's table (see the module comment). */
export interface RelativisticTszTable {
  /** Grid spacing in x; nodes at x = i·dx, i = 0 … nx − 1. */
  readonly dx: number;
  readonly nx: number;
  /** Upper end of the electron-temperature range [keV]. */
  readonly kTeMaxKeV: number;
  /** Chebyshev terms per x node. */
  readonly nTheta: number;
  /** Coefficients, x-major: coeffs[i * nTheta + k]. */
  readonly coeffs: Float64Array;
}

/** Settings of {@link buildRelativisticTszTable}. */
export interface TableSettings {
  readonly dx: number;
  readonly nx: number;
  readonly kTeMaxKeV: number;
  readonly nTheta: number;
  readonly quadrature?: RelativisticQuadrature;
}

/** Smallest x used for the x = 0 node (Y is even in x, so Y(1e-4) = Y(0) to ~1e-9). */
const X_AT_ZERO = 1e-4;

/**
 * Build the table by evaluating the exact integral at every x node and nTheta Chebyshev–Gauss nodes
 * in θ, then transforming to Chebyshev coefficients (Numerical Recipes 3rd ed., eq. 5.8.7).
 */
export function buildRelativisticTszTable(s: TableSettings): RelativisticTszTable {
  const { dx, nx, nTheta, kTeMaxKeV } = s;
  const xs = new Float64Array(nx);
  for (let i = 0; i < nx; i++) xs[i] = i === 0 ? X_AT_ZERO : i * dx;
  const y0 = xs.map((x) => tszShape(x));
  const q = new Float64Array(nTheta * nx); // q[k * nx + i] at θ node k
  const y = new Float64Array(nx);
  for (let k = 0; k < nTheta; k++) {
    const u = Math.cos((Math.PI * (k + 0.5)) / nTheta);
    const kte = 0.5 * kTeMaxKeV * (1 + u);
    tszRelativisticShapeExact(xs, kte, y, s.quadrature);
    const th = thetaFromKeV(kte);
    for (let i = 0; i < nx; i++) q[k * nx + i] = ((y[i] as number) - (y0[i] as number)) / th;
  }
  const coeffs = new Float64Array(nx * nTheta);
  for (let i = 0; i < nx; i++) {
    for (let j = 0; j < nTheta; j++) {
      let sum = 0;
      for (let k = 0; k < nTheta; k++) sum += (q[k * nx + i] as number) * Math.cos((Math.PI * j * (k + 0.5)) / nTheta);
      coeffs[i * nTheta + j] = ((j === 0 ? 1 : 2) / nTheta) * sum;
    }
  }
  return { dx, nx, nTheta, kTeMaxKeV, coeffs };
}
