/**
 * The flat-sky 2-D Fourier transform of a normalised projected profile, tabulated once per shape.
 *
 * For a spherical profile truncated at T·R500, the projection-slice theorem gives the 2-D transform
 * of the projection as the 3-D transform at k_z = 0 (e.g. Bracewell 1956, Aust. J. Phys. 9, 198):
 *   F̃(q) = ∫ ℓ(x)/ℓ(0) e^{−i q·x} d²x = 4π ∫0^T r² p(r) sin(qr)/(qr) dr / ℓ(0),
 * in units of θ500² with q = ell·θ500. A template of size θ500 (radians) then has
 *   ∫ y(θ)/y0 e^{−i ell·θ} d²θ = θ500² F̃(ell θ500)   [steradians].
 * The table is built on a grid uniform in asinh(q) (linear near 0, logarithmic beyond) and read
 * with a natural cubic spline; beyond its end the transform is extended as a power law.
 */
import { requireFinite } from "@umbra/core";
import { integrate } from "../numerics/quadrature.js";
import { DEFAULT_TRUNCATION, lineOfSightIntegral } from "./projection.js";
import type { PressureProfile } from "./types.js";

/** A tabulated Fourier transform of one normalised projected shape. */
export interface FourierShape {
  readonly profile: PressureProfile;
  readonly truncation: number;
  /** ℓ(0): the central line-of-sight integral (R500 units). */
  readonly centralLineIntegral: number;
  /** F̃(0) = ∫ ℓ/ℓ(0) d²x, in θ500² units. */
  readonly peak: number;
  /** Largest tabulated q. */
  readonly qMax: number;
  /** Grid in u = asinh(q/Q0) (uniform) and values + spline second derivatives. */
  readonly du: number;
  readonly values: Float64Array;
  readonly second: Float64Array;
  /** Power-law index of the tail beyond qMax (F̃ ∝ q^−tailIndex), fitted on the last decade. */
  readonly tailIndex: number;
}

/** Options of {@link fourierShape}. */
export interface FourierShapeOptions {
  /** Truncation radius in R500 (default 5). */
  truncation?: number;
  /** Largest q = ell·θ500 tabulated (default 1000). */
  qMax?: number;
  /** Number of table nodes (default 640). */
  nodes?: number;
}

const Q0 = 1;

/**
 * F̃(q) at one q by direct quadrature (no table): 4π ∫0^T r² p(r) sinc(q r) dr / ℓ(0), splitting
 * [0, T] into pieces no longer than 2π/q so each piece holds at most one oscillation.
 */
export function fourierShapeAt(profile: PressureProfile, q: number, truncation = DEFAULT_TRUNCATION, centralLineIntegral?: number): number {
  requireFinite("q", q, (v) => v >= 0, "negative");
  const T = requireFinite("truncation", truncation, (v) => v > 0 && Number.isFinite(v), "not a positive finite radius");
  const l0 = centralLineIntegral ?? lineOfSightIntegral(profile, 0, T);
  const p = profile.pressureRatio;
  const f = (r: number): number => {
    const qr = q * r;
    const s = qr < 1e-4 ? 1 - (qr * qr) / 6 : Math.sin(qr) / qr;
    return r * r * p(r) * s;
  };
  // first piece near the cusp: r = r1·e^{−v}
  const r1 = Math.min(T, q > 0 ? Math.PI / q : T, 0.05);
  const cuspPart = integrate((v) => {
    const r = r1 * Math.exp(-v);
    return f(r) * r;
  }, 0, 40 / Math.max(3 - profile.cuspSlope, 0.05), { rtol: 1e-12 });
  const scale = Math.abs(cuspPart) + 1e-300;
  let total = cuspPart;
  const width = q > 0 ? Math.min((2 * Math.PI) / q, 0.25) : 0.25;
  const n = Math.ceil((T - r1) / width);
  const h = (T - r1) / n;
  // absolute tolerance tied to the zero-frequency integral so cancellation cannot stall it
  const atol = (1e-11 * Math.max(scale, 1)) / Math.max(n, 1);
  for (let i = 0; i < n; i++) total += integrate(f, r1 + i * h, r1 + (i + 1) * h, { rtol: 1e-9, atol });
  return (4 * Math.PI * total) / l0;
}

function splineSecond(y: Float64Array, h: number): Float64Array {
  // natural cubic spline on a uniform grid: tridiagonal solve (Thomas algorithm)
  const n = y.length;
  const m = new Float64Array(n);
  if (n < 3) return m;
  const c = new Float64Array(n);
  const d = new Float64Array(n);
  for (let i = 1; i < n - 1; i++) {
    const rhs = (6 * (y[i + 1]! - 2 * y[i]! + y[i - 1]!)) / (h * h);
    const denom = 4 - (i > 1 ? c[i - 1]! : 0);
    c[i] = 1 / denom;
    d[i] = (rhs - (i > 1 ? d[i - 1]! : 0)) / denom;
  }
  for (let i = n - 2; i >= 1; i--) m[i] = d[i]! - c[i]! * m[i + 1]!;
  return m;
}

/** Tables kept (least recently built first out): a mass-dependent profile makes one table per mass. */
const CACHE_LIMIT = 64;
const cache = new Map<string, FourierShape>();

/**
 * Tabulate F̃(q) for `profile` (cached per profile key, truncation and grid; the last 64 tables
 * are kept). Building costs ~0.5 s once; reading is a spline lookup.
 */
export function fourierShape(profile: PressureProfile, opts: FourierShapeOptions = {}): FourierShape {
  const T = requireFinite("truncation", opts.truncation ?? DEFAULT_TRUNCATION, (v) => v > 0 && Number.isFinite(v), "not a positive finite radius");
  const qMax = requireFinite("qMax", opts.qMax ?? 1000, (v) => v > 0, "not positive");
  const nodes = Math.round(requireFinite("nodes", opts.nodes ?? 640, (v) => v >= 16, "below 16"));
  const key = `${profile.key}|${T}|${qMax}|${nodes}`;
  const hit = cache.get(key);
  if (hit !== undefined) return hit;
  const l0 = lineOfSightIntegral(profile, 0, T);
  const uMax = Math.asinh(qMax / Q0);
  const du = uMax / (nodes - 1);
  const values = new Float64Array(nodes);
  for (let i = 0; i < nodes; i++) values[i] = fourierShapeAt(profile, Q0 * Math.sinh(i * du), T, l0);
  const second = splineSecond(values, du);
  // tail index from the last decade (absolute values; the tail of a cusp is a power law)
  const qA = qMax / 10;
  const fA = Math.abs(fourierShapeAt(profile, qA, T, l0));
  const fB = Math.abs(values[nodes - 1]!);
  const tailIndex = fA > 0 && fB > 0 ? Math.log(fA / fB) / Math.log(10) : 3;
  const shape: FourierShape = { profile, truncation: T, centralLineIntegral: l0, peak: values[0]!, qMax, du, values, second, tailIndex };
  if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value as string);
  cache.set(key, shape);
  return shape;
}

/** F̃(q) from the table (spline inside, power-law tail beyond qMax). */
export function fourierShapeLookup(shape: FourierShape, q: number): number {
  const aq = Math.abs(q);
  if (aq >= shape.qMax) return shape.values[shape.values.length - 1]! * (aq / shape.qMax) ** -shape.tailIndex;
  const u = Math.asinh(aq / Q0) / shape.du;
  const n = shape.values.length;
  let i = Math.floor(u);
  if (i >= n - 1) i = n - 2;
  const t = u - i;
  const y0 = shape.values[i]!;
  const y1 = shape.values[i + 1]!;
  const m0 = shape.second[i]!;
  const m1 = shape.second[i + 1]!;
  const h2 = shape.du * shape.du;
  return (1 - t) * y0 + t * y1 + ((((1 - t) ** 3 - (1 - t)) * m0 + (t ** 3 - t) * m1) * h2) / 6;
}

/**
 * The template's Fourier transform at multipoles `ells` for a cluster of size θ500 (radians):
 * ∫ y(θ)/y0 e^{−i ell·θ} d²θ = θ500² F̃(ell θ500), in steradians. Writes into `out` if given.
 */
export function profileFourierAtEll(shape: FourierShape, theta500Rad: number, ells: Float64Array, out?: Float64Array): Float64Array {
  requireFinite("theta500Rad", theta500Rad, (v) => v > 0, "not positive");
  const res = out ?? new Float64Array(ells.length);
  const t2 = theta500Rad * theta500Rad;
  // the spline evaluation of fourierShapeLookup, inlined for the per-mode loop
  const { values, second, du, qMax, tailIndex } = shape;
  const n = values.length;
  const invDu = 1 / du;
  const h26 = (du * du) / 6;
  const last = values[n - 1]!;
  for (let i = 0; i < ells.length; i++) {
    const q = Math.abs(ells[i]! * theta500Rad);
    if (q >= qMax) {
      res[i] = t2 * last * (q / qMax) ** -tailIndex;
      continue;
    }
    const u = Math.log(q + Math.sqrt(q * q + 1)) * invDu; // asinh(q/Q0), Q0 = 1
    let j = Math.floor(u);
    if (j >= n - 1) j = n - 2;
    const t = u - j;
    const s = 1 - t;
    res[i] = t2 * (s * values[j]! + t * values[j + 1]! + ((s * s * s - s) * second[j]! + (t * t * t - t) * second[j + 1]!) * h26);
  }
  return res;
}
