/**
 * ILC weight algebra on one domain: given the band-by-band covariance C (m×m) of the maps in that
 * domain and the spectral responses of the components, return the weights of the linear
 * combination.
 *
 * - Standard ILC: w = C⁻¹a / (aᵀC⁻¹a) — unit response to the target SED a, minimum variance
 *   (common practice; e.g. Eriksen et al. 2004, ApJ 612, 633, eq. 3–5).
 * - Constrained ILC: wᵀ = eᵀ (AᵀC⁻¹A)⁻¹ AᵀC⁻¹ with A = [a, b₁, …, b_{k−1}] and e = (1, 0, …, 0)ᵀ:
 *   unit response to a, zero response to every bᵢ, minimum variance among such weights
 *   (Remazeilles, Delabrouille & Cardoso 2011, MNRAS 410, 2481, eq. 18).
 *
 * Covariances are held as row-major Float64Array (m·m). Before solving, C is rescaled to unit
 * diagonal (D C D with D = diag(C_ii^−½)); the weights are invariant under that change of basis
 * (w = D w′ for C′ = DCD, A′ = DA) and the solve is better conditioned when bands differ in unit.
 */
import { CholeskyDecomposition, EigenvalueDecomposition, Matrix } from "ml-matrix";
import { UmbraError } from "@umbra/core";

/** Result of {@link checkCovariance}. */
export interface CovarianceCheck {
  /** Number of bands m. */
  size: number;
  /** True when the Cholesky factorisation of C succeeds (C symmetric positive definite). */
  positiveDefinite: boolean;
  /** Smallest and largest eigenvalue of C (C's own unit). */
  eigenvalueMin: number;
  eigenvalueMax: number;
  /** Condition number λmax/λmin of C (Infinity when λmin ≤ 0). */
  conditionNumber: number;
  /** Condition number of the correlation matrix D C D (unit diagonal): what the solve actually sees. */
  correlationConditionNumber: number;
}

/** The symmetric part ½(C + Cᵀ) as an ml-matrix (its Cholesky insists on exact symmetry). */
function toMatrix(cov: Float64Array, m: number): Matrix {
  const mat = new Matrix(m, m);
  for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) mat.set(i, j, 0.5 * ((cov[i * m + j] as number) + (cov[j * m + i] as number)));
  return mat;
}

function sizeOf(cov: Float64Array): number {
  const m = Math.round(Math.sqrt(cov.length));
  if (m * m !== cov.length || m === 0) throw new UmbraError("INTERNAL", `covariance of length ${cov.length} is not a square matrix`);
  return m;
}

function eigenRange(mat: Matrix): [number, number] {
  const ev = new EigenvalueDecomposition(mat, { assumeSymmetric: true }).realEigenvalues;
  return [Math.min(...ev), Math.max(...ev)];
}

function unitDiagonal(cov: Float64Array, m: number): { scaled: Float64Array; d: Float64Array } {
  const d = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const cii = cov[i * m + i] as number;
    d[i] = cii > 0 && Number.isFinite(cii) ? 1 / Math.sqrt(cii) : NaN;
  }
  const scaled = new Float64Array(m * m);
  for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) scaled[i * m + j] = (cov[i * m + j] as number) * (d[i] as number) * (d[j] as number);
  return { scaled, d };
}

/**
 * Check a band covariance: positive definiteness (Cholesky) and condition number (eigenvalues of the
 * symmetric matrix). Pure; never throws on a bad matrix, only reports it.
 */
export function checkCovariance(cov: Float64Array): CovarianceCheck {
  const m = sizeOf(cov);
  let finite = true;
  for (let i = 0; i < cov.length; i++) if (!Number.isFinite(cov[i] as number)) finite = false;
  if (!finite) {
    return { size: m, positiveDefinite: false, eigenvalueMin: NaN, eigenvalueMax: NaN, conditionNumber: Infinity, correlationConditionNumber: Infinity };
  }
  const mat = toMatrix(cov, m);
  const positiveDefinite = new CholeskyDecomposition(mat).isPositiveDefinite();
  const [lo, hi] = eigenRange(mat);
  const { scaled } = unitDiagonal(cov, m);
  let corrCond = Infinity;
  if (scaled.every((v) => Number.isFinite(v))) {
    const [clo, chi] = eigenRange(toMatrix(scaled, m));
    corrCond = clo > 0 ? chi / clo : Infinity;
  }
  return {
    size: m,
    positiveDefinite,
    eigenvalueMin: lo,
    eigenvalueMax: hi,
    conditionNumber: lo > 0 ? hi / lo : Infinity,
    correlationConditionNumber: corrCond,
  };
}

/**
 * Constrained ILC weights (Remazeilles, Delabrouille & Cardoso 2011, MNRAS 410, 2481, eq. 18):
 * wᵀ = eᵀ (AᵀC⁻¹A)⁻¹ AᵀC⁻¹, so that w·constraints[0] = 1 and w·constraints[j] = 0 for j ≥ 1, with
 * the smallest wᵀCw among all such weights. With one constraint this is the standard ILC
 * w = C⁻¹a/(aᵀC⁻¹a).
 *
 * @param cov band covariance, row-major m·m, in (map unit)².
 * @param constraints k response vectors of length m (map unit per unit of component); the first is the target.
 * @param domain a label used in error messages (e.g. "ell window 2").
 * @returns weights of length m, in (target unit) per (map unit).
 * @throws UmbraError BAD_DATA when C is not positive definite or the constraints are degenerate (k > m, collinear SEDs).
 */
export function constrainedIlcWeights(cov: Float64Array, constraints: readonly Float64Array[], domain = "domain"): Float64Array {
  const m = sizeOf(cov);
  const k = constraints.length;
  if (k === 0) throw new UmbraError("INTERNAL", "ILC needs at least the target response");
  for (const c of constraints) if (c.length !== m) throw new UmbraError("INTERNAL", `response of length ${c.length} for ${m} bands`);
  if (k > m) {
    throw new UmbraError("BAD_DATA", `${k} constraints (target + deprojected components) need at least ${k} bands, have ${m}`, { field: domain });
  }
  const { scaled, d } = unitDiagonal(cov, m);
  if (!scaled.every((v) => Number.isFinite(v))) {
    throw new UmbraError("BAD_DATA", `band covariance in ${domain} has a non-positive or non-finite diagonal`, { field: domain });
  }
  const chol = new CholeskyDecomposition(toMatrix(scaled, m));
  if (!chol.isPositiveDefinite()) {
    throw new UmbraError("BAD_DATA", `band covariance in ${domain} is not positive definite (Cholesky failed)`, { field: domain });
  }
  // A' = D A (m×k)
  const aRows: number[][] = [];
  for (let i = 0; i < m; i++) {
    const row: number[] = [];
    for (let j = 0; j < k; j++) row.push(((constraints[j] as Float64Array)[i] as number) * (d[i] as number));
    aRows.push(row);
  }
  const aMat = new Matrix(aRows);
  const cInvA = chol.solve(aMat); // m×k
  const gram = aMat.transpose().mmul(cInvA); // k×k = A'ᵀ C'⁻¹ A'
  const gramChol = new CholeskyDecomposition(toMatrix(Float64Array.from(gram.to1DArray()), k));
  if (!gramChol.isPositiveDefinite()) {
    throw new UmbraError("BAD_DATA", `constraints in ${domain} are degenerate (component SEDs linearly dependent across the bands)`, { field: domain });
  }
  const e = Matrix.zeros(k, 1);
  e.set(0, 0, 1);
  const x = gramChol.solve(e); // k×1
  const wPrime = cInvA.mmul(x); // m×1
  const w = new Float64Array(m);
  for (let i = 0; i < m; i++) w[i] = wPrime.get(i, 0) * (d[i] as number);
  return w;
}

/**
 * Standard ILC weights w = C⁻¹a / (aᵀC⁻¹a) (Eriksen et al. 2004, ApJ 612, 633, eq. 5): unit
 * response to the target SED `a`, minimum output variance wᵀCw = 1/(aᵀC⁻¹a).
 */
export function standardIlcWeights(cov: Float64Array, target: Float64Array, domain = "domain"): Float64Array {
  return constrainedIlcWeights(cov, [target], domain);
}

/** Output variance wᵀCw of weights `w` on covariance `cov` (row-major m·m). */
export function combinedVariance(cov: Float64Array, w: Float64Array): number {
  const m = w.length;
  let s = 0;
  for (let i = 0; i < m; i++) {
    let row = 0;
    for (let j = 0; j < m; j++) row += (cov[i * m + j] as number) * (w[j] as number);
    s += (w[i] as number) * row;
  }
  return s;
}
