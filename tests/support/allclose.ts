/**
 * `expect(actual).toAllClose(expected, { rtol, atol })`: element-wise |a − e| ≤ atol + rtol·|e|,
 * as numpy's `assert_allclose` (common practice; vitest's `toBeCloseTo` is absolute only).
 * Works on numbers, arrays and typed arrays; NaN equals NaN only when `equalNan` (default true).
 */
import { expect } from "vitest";

export interface AllCloseOptions {
  rtol?: number;
  atol?: number;
  equalNan?: boolean;
}

type Numeric = number | ArrayLike<number>;

function toArray(x: Numeric): ArrayLike<number> {
  return typeof x === "number" ? [x] : x;
}

/** Returns null when close, else a message naming the worst element. */
export function allCloseMismatch(actual: Numeric, expected: Numeric, opts: AllCloseOptions = {}): string | null {
  const rtol = opts.rtol ?? 1e-7;
  const atol = opts.atol ?? 0;
  const equalNan = opts.equalNan ?? true;
  const a = toArray(actual);
  const e = toArray(expected);
  const broadcast = e.length === 1 && a.length > 1;
  if (!broadcast && a.length !== e.length) return `length ${a.length} differs from expected length ${e.length}`;
  let bad = 0;
  let worst = -1;
  let worstExcess = -Infinity;
  for (let i = 0; i < a.length; i++) {
    const ai = a[i] as number;
    const ei = (broadcast ? e[0] : e[i]) as number;
    if (Number.isNaN(ai) || Number.isNaN(ei)) {
      if (equalNan && Number.isNaN(ai) && Number.isNaN(ei)) continue;
      bad++;
      if (worstExcess < Infinity) {
        worstExcess = Infinity;
        worst = i;
      }
      continue;
    }
    if (ai === ei) continue; // also handles equal infinities
    const tol = atol + rtol * Math.abs(ei);
    const excess = Math.abs(ai - ei) - tol;
    if (!(excess <= 0)) {
      bad++;
      if (excess > worstExcess) {
        worstExcess = excess;
        worst = i;
      }
    }
  }
  if (bad === 0) return null;
  const ai = a[worst] as number;
  const ei = (broadcast ? e[0] : e[worst]) as number;
  const rel = Math.abs(ai - ei) / Math.abs(ei);
  return `${bad} of ${a.length} elements not close (rtol=${rtol}, atol=${atol}); worst at [${worst}]: actual ${ai}, expected ${ei}, |diff| ${Math.abs(ai - ei)}, rel ${rel}`;
}

expect.extend({
  toAllClose(received: Numeric, expected: Numeric, opts?: AllCloseOptions) {
    const msg = allCloseMismatch(received, expected, opts);
    return {
      pass: msg === null,
      message: () => (msg === null ? "expected values not to be all close" : msg),
    };
  },
});

declare module "vitest" {
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- must match vitest's declaration
  interface Matchers<T = any> {
    /** Element-wise |actual − expected| ≤ atol + rtol·|expected| (numpy's assert_allclose). */
    toAllClose(expected: Numeric, opts?: AllCloseOptions): T;
  }
}
