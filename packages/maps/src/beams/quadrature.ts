/**
 * Gauss–Legendre quadrature nodes and weights on [−1, 1], computed once by Newton's method on
 * P_n with the three-term recurrence (Abramowitz & Stegun 1964, §25.4.29; Press et al. 2007,
 * Numerical Recipes 3rd ed., §4.6.1). An n-point rule integrates polynomials of degree 2n − 1
 * exactly.
 */

/** Nodes and weights of the n-point Gauss–Legendre rule on [−1, 1]. */
export function gaussLegendre(n: number): { nodes: Float64Array; weights: Float64Array } {
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < Math.ceil(n / 2); i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      const pn = n === 1 ? x : p1;
      const pm = n === 1 ? 1 : p0;
      dp = (n * (x * pn - pm)) / (x * x - 1);
      const dx = pn / dp;
      x -= dx;
      if (Math.abs(dx) < 1e-16) break;
    }
    nodes[i] = -x;
    nodes[n - 1 - i] = x;
    const w = 2 / ((1 - x * x) * dp * dp);
    weights[i] = w;
    weights[n - 1 - i] = w;
  }
  return { nodes, weights };
}

/** The 8-point rule used by the beam transforms. */
export const GL8 = gaussLegendre(8);
