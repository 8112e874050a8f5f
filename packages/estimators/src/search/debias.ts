/**
 * Debiased S/N of a blind detection. The S/N maximised over position (2 parameters) and size
 * (1 parameter) is biased high: ⟨ξ⟩ = sqrt(ζ² + 3) for a cluster of true S/N ζ (Vanderlinde et
 * al. 2010, ApJ 722, 1180, sec. 5.1; the 3 counts the maximised parameters; Zubeldia et al. 2021,
 * MNRAS 507, 4852). Inverting the mean relation gives the debiased ζ̂ = sqrt(max(ξ² − nFree, 0)).
 */

/** ζ̂ = sqrt(max(ξ² − nFree, 0)) with nFree maximised parameters (default 3: x, y, size). */
export function debiasedSnr(rawSnr: number, nFree = 3): number {
  return Math.sqrt(Math.max(rawSnr * rawSnr - nFree, 0));
}
