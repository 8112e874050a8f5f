/**
 * Adaptive Gauss–Kronrod quadrature (7-point Gauss embedded in 15-point Kronrod), the scheme of
 * QUADPACK's QAG (Piessens et al. 1983, QUADPACK, Springer). Nodes and weights: Kronrod 1965 as
 * tabulated in QUADPACK's qk15. Used for every smooth 1-D integral in this package.
 */
import { UmbraError } from "@umbra/core";

const XGK = [
  0.991455371120812639206854697526329, 0.949107912342758524526189684047851, 0.864864423359769072789712788640926,
  0.741531185599394439863864773280788, 0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
  0.207784955007898467600689403773245, 0.0,
];
const WGK = [
  0.02293532201052922496373200805897, 0.063092092629978553290700663189204, 0.104790010322250183839876322541518,
  0.140653259715525918745189590510238, 0.16900472663926790282658342659855, 0.190350578064785409913256402421014,
  0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
];
/** Gauss 7-point weights, at XGK[1], XGK[3], XGK[5], XGK[7]. */
const WG = [0.129484966168869693270611432679082, 0.27970539148927666790146777142378, 0.381830050505118944950369775488975, 0.417959183673469387755102040816327];

/** One 15-point Kronrod panel: [Kronrod estimate, |Kronrod − Gauss|]. */
export function gaussKronrod15(f: (x: number) => number, a: number, b: number): [number, number] {
  const c = 0.5 * (a + b);
  const h = 0.5 * (b - a);
  const fc = f(c);
  let k = fc * WGK[7]!;
  let g = fc * WG[3]!;
  for (let j = 0; j < 7; j++) {
    const dx = h * XGK[j]!;
    const s = f(c - dx) + f(c + dx);
    k += WGK[j]! * s;
    if (j % 2 === 1) g += WG[(j - 1) / 2]! * s;
  }
  return [k * h, Math.abs((k - g) * h)];
}

/** Options of {@link integrate}. */
export interface QuadOptions {
  /** Relative tolerance on the total (default 1e-10). */
  rtol?: number;
  /** Absolute tolerance on the total (default 0). */
  atol?: number;
  /** Most panels before giving up (default 2000). */
  maxPanels?: number;
}

/**
 * ∫_a^b f(x) dx by globally adaptive Gauss–Kronrod 7/15 bisection: the panel with the largest
 * error estimate is split until the summed estimate is below max(atol, rtol·|I|). Throws NUMERIC
 * when `maxPanels` is reached without meeting the tolerance.
 */
export function integrate(f: (x: number) => number, a: number, b: number, opts: QuadOptions = {}): number {
  if (a === b) return 0;
  const rtol = opts.rtol ?? 1e-10;
  const atol = opts.atol ?? 0;
  const maxPanels = opts.maxPanels ?? 2000;
  const lo: number[] = [a];
  const hi: number[] = [b];
  const [v0, e0] = gaussKronrod15(f, a, b);
  const val: number[] = [v0];
  const err: number[] = [e0];
  let total = v0;
  let totalErr = e0;
  while (totalErr > Math.max(atol, rtol * Math.abs(total))) {
    if (val.length >= maxPanels) {
      throw new UmbraError("NUMERIC", `adaptive quadrature did not reach rtol ${rtol} in ${maxPanels} panels (estimate ${total}, error ${totalErr})`);
    }
    let worst = 0;
    for (let i = 1; i < err.length; i++) if (err[i]! > err[worst]!) worst = i;
    const pa = lo[worst]!;
    const pb = hi[worst]!;
    const mid = 0.5 * (pa + pb);
    const [v1, e1] = gaussKronrod15(f, pa, mid);
    const [v2, e2] = gaussKronrod15(f, mid, pb);
    total += v1 + v2 - val[worst]!;
    totalErr += e1 + e2 - err[worst]!;
    hi[worst] = mid;
    val[worst] = v1;
    err[worst] = e1;
    lo.push(mid);
    hi.push(pb);
    val.push(v2);
    err.push(e2);
    if (mid === pa || mid === pb) break; // cannot split further in double precision
  }
  // re-sum to avoid drift from the running updates
  let s = 0;
  for (const v of val) s += v;
  return s;
}
