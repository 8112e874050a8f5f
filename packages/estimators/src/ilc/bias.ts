/**
 * The ILC bias: with the covariance estimated from the same N_p independent samples the weights are
 * applied to, the empirical minimisation uses the m − 1 free directions of the weights to cancel the
 * part of the target that happens to correlate with the contaminants, so a fraction ≈ (m − 1)/N_p of
 * the target is lost (Delabrouille et al. 2009, A&A 493, 835, their discussion of the ILC bias;
 * section number not checked). With k linear constraints (the target plus k − 1 deprojected components) only m − k
 * directions are free, so the fraction becomes (m − k)/N_p (the same argument with m − k free
 * directions; our generalisation).
 *
 * N_p counts real degrees of freedom: a stored half-plane Fourier mode with a conjugate partner that
 * is not stored carries two (its real and imaginary parts), a self-conjugate one carries one, which
 * is exactly the layout's hermitianWeight. When modes enter the covariance with weights u_k (a smooth
 * ell window squared), the effective count is Kish's (Σ d_k u_k)² / Σ d_k u_k² (Kish 1965, Survey
 * Sampling, §11.7); an apodisation window w(x) further correlates neighbouring modes and scales the
 * count by ⟨w²⟩²/⟨w⁴⟩ (Hivon et al. 2002, ApJ 567, 2, the w2²/w4
 * factor in their degrees-of-freedom count; equation number from memory, not checked).
 */

/** Fraction of the target cancelled by the ILC in one domain: (m − k)/N_p (Delabrouille et al. 2009). */
export function ilcBiasFraction(bandCount: number, constraintCount: number, independentModes: number): number {
  if (!(independentModes > 0)) return Infinity;
  return Math.max(0, bandCount - constraintCount) / independentModes;
}

/**
 * Effective number of independent real samples in a weighted sum over modes:
 * (Σ d_k u_k)² / Σ d_k u_k², with d_k the real degrees of freedom of mode k and u_k ≥ 0 its weight.
 */
export function effectiveModeCount(dof: Float64Array, weight: Float64Array): number {
  let s1 = 0;
  let s2 = 0;
  for (let k = 0; k < dof.length; k++) {
    const u = weight[k] as number;
    if (u === 0) continue;
    const d = dof[k] as number;
    s1 += d * u;
    s2 += d * u * u;
  }
  return s2 > 0 ? (s1 * s1) / s2 : 0;
}

/**
 * The factor ⟨w²⟩²/⟨w⁴⟩ (≤ 1) by which an apodisation window w reduces the number of independent
 * Fourier modes (Hivon et al. 2002, ApJ 567, 2). 1 for a window that is 1 everywhere.
 */
export function apodisationModeFactor(window: Float64Array): number {
  let w2 = 0;
  let w4 = 0;
  for (let i = 0; i < window.length; i++) {
    const v = (window[i] as number) ** 2;
    w2 += v;
    w4 += v * v;
  }
  if (w4 === 0) return 0;
  return (w2 * w2) / (w4 * window.length);
}
