/**
 * Gauss–Legendre nodes and weights on [−1, 1], by Newton iteration on P_n from the Tricomi initial
 * guesses (Abramowitz & Stegun 1964, 25.4.29; Press et al. 2007, Numerical Recipes 3rd ed., §4.6).
 * Cached per order; exact for polynomials up to degree 2n − 1.
 */

/** Nodes (ascending) and weights of an n-point Gauss–Legendre rule on [−1, 1]. */
export interface GaussRule {
  readonly nodes: Float64Array;
  readonly weights: Float64Array;
}

const cache = new Map<number, GaussRule>();

/** The n-point Gauss–Legendre rule on [−1, 1] (n ≥ 1), computed once and cached. */
export function gaussLegendre(n: number): GaussRule {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`Gauss–Legendre order must be a positive integer, got ${n}`);
  const hit = cache.get(n);
  if (hit !== undefined) return hit;
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  const m = (n + 1) >> 1;
  for (let i = 0; i < m; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let pp = 0;
    for (let iter = 0; iter < 100; iter++) {
      let p1 = 1;
      let p2 = 0;
      for (let j = 1; j <= n; j++) {
        const p3 = p2;
        p2 = p1;
        p1 = ((2 * j - 1) * z * p2 - (j - 1) * p3) / j;
      }
      pp = (n * (z * p1 - p2)) / (z * z - 1);
      const dz = p1 / pp;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    // recompute derivative at the converged node
    let p1 = 1;
    let p2 = 0;
    for (let j = 1; j <= n; j++) {
      const p3 = p2;
      p2 = p1;
      p1 = ((2 * j - 1) * z * p2 - (j - 1) * p3) / j;
    }
    pp = (n * (z * p1 - p2)) / (z * z - 1);
    const w = 2 / ((1 - z * z) * pp * pp);
    nodes[i] = -z;
    nodes[n - 1 - i] = z;
    weights[i] = w;
    weights[n - 1 - i] = w;
  }
  if (n % 2 === 1) nodes[m - 1] = 0;
  const rule = { nodes, weights };
  cache.set(n, rule);
  return rule;
}
