/**
 * Thermal SZ with relativistic electrons, exact to first order in optical depth: the Planck
 * spectrum scattered once by a Maxwell–Jüttner electron population (Wright 1979, ApJ 232, 348).
 *
 * Method. A photon scattered by an electron of speed β, from incoming direction cosine μ to
 * outgoing μ' (both in the electron frame's reference axis), has its log-frequency shifted by
 * s = ln[(1 + βμ')/(1 − βμ)]. Wright's single-scattering redistribution
 *   P(s; β) = 3/(16γ⁴β) ∫ dμ (1 + βμ')(1 + μ²μ'² + ½(1 − μ²)(1 − μ'²)) (1 − βμ)⁻³
 * (Wright 1979, from memory; also Birkinshaw 1999, Phys. Rep. 310, 97; equation numbers not checked), after the change
 * of variable s → μ' (ds = β dμ'/(1 + βμ')), becomes a smooth integral over the square
 * (μ, μ') ∈ [−1, 1]², with total probability exactly one. Averaging over the Maxwell–Jüttner
 * distribution p² exp(−γ/θ) dp / (θ K₂(1/θ)) (p = γβ; Jüttner 1911) and applying
 * I(ν) = ∫ P₁(s) I₀(ν e⁻ˢ) ds gives ΔI/I0 = τ [∫ P₁(s) j(x e⁻ˢ) ds − j(x)], j(x) = x³/(eˣ − 1).
 * With y = τ θ the response per unit y is that bracket divided by θ.
 *
 * Quadrature: Gauss–Legendre in μ and μ' (40 × 40 nodes) and in t = √u, u = (γ − 1)/θ ∈ [0, 60]
 * (32 nodes; the e⁻⁶⁰ tail is below 1e-24); the Maxwell–Jüttner normalisation is the same
 * quadrature of the weight alone, so P₁ integrates to one by construction. Convergence is checked in
 * the tests by doubling every order (agreement better than 1e-8 relative away from the null).
 */
import { UmbraError } from "@umbra/core";
import { thetaFromKeV } from "./constants.js";
import { gaussLegendre } from "./gaussLegendre.js";
import { blackbodyDerivativeShape, cmbIntensityScale, dimensionlessFrequency } from "./planck.js";
import { tszShape } from "./tsz.js";

/** Quadrature orders of the exact integral (see the module comment). */
export interface RelativisticQuadrature {
  /** Gauss–Legendre nodes in each of μ and μ' (default 40). */
  readonly angleNodes?: number;
  /** Gauss–Legendre nodes in t = √((γ−1)/θ) (default 32). */
  readonly speedNodes?: number;
  /** Upper limit of (γ − 1)/θ (default 60). */
  readonly uMax?: number;
}

/** Largest electron temperature accepted [keV] (θ ≈ 0.39); accuracy is verified to 60 keV. */
export const MAX_KTE_KEV = 200;

/** A discretised scattering kernel for one θ: weights Kᵢ and frequency ratios rᵢ = e^(−sᵢ). */
interface Kernel {
  readonly weight: Float64Array;
  readonly ratio: Float64Array;
}

/** Validate an electron temperature in keV: finite, 0 ≤ kTe ≤ {@link MAX_KTE_KEV}. */
export function checkElectronTemperature(kTeKeV: number): number {
  if (!Number.isFinite(kTeKeV) || kTeKeV < 0 || kTeKeV > MAX_KTE_KEV) {
    throw new UmbraError("BAD_VALUE", `electron temperature ${String(kTeKeV)} keV is outside [0, ${MAX_KTE_KEV}] keV`, {
      field: "kTeKeV",
      value: kTeKeV,
    });
  }
  return kTeKeV;
}

let cachedKey = "";
let cachedKernel: Kernel | undefined;

/** The kernel for θ, reusing the last one built when θ and the orders repeat (a band at one kTe). */
function kernelFor(theta: number, q: RelativisticQuadrature): Kernel {
  const key = `${theta}|${q.angleNodes ?? 40}|${q.speedNodes ?? 32}|${q.uMax ?? 60}`;
  if (key !== cachedKey || cachedKernel === undefined) {
    cachedKernel = buildKernel(theta, q);
    cachedKey = key;
  }
  return cachedKernel;
}

function buildKernel(theta: number, q: RelativisticQuadrature): Kernel {
  const na = q.angleNodes ?? 40;
  const nt = q.speedNodes ?? 32;
  const tMax = Math.sqrt(q.uMax ?? 60);
  const ang = gaussLegendre(na);
  const spd = gaussLegendre(nt);
  const n = nt * na * na;
  const weight = new Float64Array(n);
  const ratio = new Float64Array(n);
  let norm = 0;
  let k = 0;
  for (let it = 0; it < nt; it++) {
    const t = 0.5 * tMax * (1 + (spd.nodes[it] as number));
    const u = t * t;
    const gamma = 1 + theta * u;
    const p = Math.sqrt(theta * u * (2 + theta * u));
    const beta = p / gamma;
    // p² dp e^(−u) with u = t²: ∝ t² √(2 + θt²) γ e^(−t²) dt (constant factors cancel in the normalisation)
    const wt = (spd.weights[it] as number) * t * t * Math.sqrt(2 + theta * u) * gamma * Math.exp(-u);
    norm += wt;
    const g2 = gamma * gamma;
    const pre = (wt * 3) / (16 * g2 * g2);
    for (let i = 0; i < na; i++) {
      const mu = ang.nodes[i] as number;
      const a = 1 - beta * mu;
      const wi = (pre * (ang.weights[i] as number)) / (a * a * a);
      const mu2 = mu * mu;
      for (let j = 0; j < na; j++) {
        const mup = ang.nodes[j] as number;
        const mup2 = mup * mup;
        const phi = 1 + mu2 * mup2 + 0.5 * (1 - mu2) * (1 - mup2);
        weight[k] = wi * (ang.weights[j] as number) * phi;
        ratio[k] = a / (1 + beta * mup);
        k++;
      }
    }
  }
  for (let i = 0; i < n; i++) weight[i] = (weight[i] as number) / norm;
  return { weight, ratio };
}

/** j(x) = x³/(eˣ − 1), the Planck spectrum in units of I0. */
function planckShape(x: number): number {
  return (x * x * x) / Math.expm1(x);
}

/**
 * Exact relativistic tSZ at dimensionless frequencies x (x = hν/k_BT0), for one electron
 * temperature: fills `out` with ΔT/T0 per unit y (the thermodynamic temperature change; equals
 * x coth(x/2) − 4 at kTe = 0). Method and source: module comment (Wright 1979, ApJ 232, 348).
 */
export function tszRelativisticShapeExact(
  x: Float64Array,
  kTeKeV: number,
  out: Float64Array = new Float64Array(x.length),
  quadrature: RelativisticQuadrature = {},
): Float64Array {
  checkElectronTemperature(kTeKeV);
  if (kTeKeV === 0) {
    for (let i = 0; i < x.length; i++) out[i] = tszShape(x[i] as number);
    return out;
  }
  const theta = thetaFromKeV(kTeKeV);
  const { weight, ratio } = kernelFor(theta, quadrature);
  const n = weight.length;
  for (let i = 0; i < x.length; i++) {
    const xi = x[i] as number;
    const j0 = planckShape(xi);
    let s = 0;
    for (let k = 0; k < n; k++) {
      const z = xi * (ratio[k] as number);
      // exp(z) − 1 loses < 1e-15/z relative; expm1 (slower in V8) only where that matters
      const d = z > 0.5 ? Math.exp(z) - 1 : Math.expm1(z);
      s += (weight[k] as number) * ((z * z * z) / d - j0);
    }
    out[i] = s / (theta * blackbodyDerivativeShape(xi));
  }
  return out;
}

/**
 * Exact relativistic tSZ response at ν (GHz) and kTe (keV), as ΔT/T0 per unit Compton-y
 * (dimensionless; × T0 gives K_CMB per y). Single scattering of a Planck spectrum by a
 * Maxwell–Jüttner population (Wright 1979, ApJ 232, 348); numerical accuracy better than 1e-6
 * relative away from the crossover. Costs about a millisecond: use
 * {@link createFastRelativisticTsz} in loops.
 */
export function tszResponseRelativistic(frequencyGHz: number, kTeKeV: number): number {
  const x = dimensionlessFrequency(frequencyGHz);
  return tszRelativisticShapeExact(Float64Array.of(x), kTeKeV)[0] as number;
}

/** Exact relativistic tSZ intensity change per unit y in MJy/sr at ν (GHz), kTe (keV) (Wright 1979, ApJ 232, 348). */
export function tszIntensityRelativistic(frequencyGHz: number, kTeKeV: number): number {
  const x = dimensionlessFrequency(frequencyGHz);
  return cmbIntensityScale() * blackbodyDerivativeShape(x) * tszResponseRelativistic(frequencyGHz, kTeKeV);
}
