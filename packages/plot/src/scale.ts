/** Axis scales and tick placement. */

/** A map from data values to pixel positions, with its ticks. */
export interface Scale {
  readonly domain: readonly [number, number];
  readonly range: readonly [number, number];
  readonly log: boolean;
  (value: number): number;
  ticks(count?: number): number[];
}

/** Ticks at 1, 2 or 5 × 10^k spanning [lo, hi] with about `count` steps (common practice, no source). */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const norm = raw / mag;
  // round the step to the nearest of 1, 2, 5, 10 in log space (the rule d3-array's ticks use)
  const step = (norm >= Math.sqrt(50) ? 10 : norm >= Math.sqrt(10) ? 5 : norm >= Math.SQRT2 ? 2 : 1) * mag;
  const start = Math.ceil(lo / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let v = start; v <= hi + step * 1e-9; v += step) ticks.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return ticks;
}

/** Linear scale from `domain` to `range`. */
export function linearScale(domain: readonly [number, number], range: readonly [number, number]): Scale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const k = d1 === d0 ? 0 : (r1 - r0) / (d1 - d0);
  const f = ((v: number) => r0 + (v - d0) * k) as Scale;
  return Object.assign(f, { domain, range, log: false, ticks: (count = 5) => niceTicks(Math.min(d0, d1), Math.max(d0, d1), count) });
}

/** Base-10 logarithmic scale (domain must be positive); ticks at powers of ten (and 2, 5 when the span is short). */
export function logScale(domain: readonly [number, number], range: readonly [number, number]): Scale {
  const [d0, d1] = domain;
  if (!(d0 > 0 && d1 > 0)) throw new RangeError(`log scale needs a positive domain, got [${d0}, ${d1}]`);
  const l0 = Math.log10(d0);
  const l1 = Math.log10(d1);
  const [r0, r1] = range;
  const k = l1 === l0 ? 0 : (r1 - r0) / (l1 - l0);
  const f = ((v: number) => r0 + (Math.log10(v) - l0) * k) as Scale;
  const ticks = (): number[] => {
    const lo = Math.min(l0, l1);
    const hi = Math.max(l0, l1);
    const out: number[] = [];
    const mults = hi - lo < 2 ? [1, 2, 5] : [1];
    for (let e = Math.floor(lo); e <= Math.ceil(hi); e++) {
      for (const m of mults) {
        const v = m * 10 ** e;
        const lv = Math.log10(v);
        if (lv >= lo - 1e-9 && lv <= hi + 1e-9) out.push(v);
      }
    }
    return out;
  };
  return Object.assign(f, { domain, range, log: true, ticks });
}

/** Short tick label: up to 4 significant digits, exponent form outside [1e-3, 1e5). */
export function formatTick(v: number): string {
  if (v === 0) return "0";
  const a = Math.abs(v);
  if (a >= 1e5 || a < 1e-3) {
    const [m, e] = v.toExponential(1).split("e");
    const mant = (m ?? "").replace(/\.0$/, "");
    return `${mant}e${Number(e)}`;
  }
  return Number(v.toPrecision(4)).toString();
}

/** [min, max] of the finite values of `values` (padded by `pad` of the span); [0, 1] when none. */
export function extent(values: Iterable<number>, pad = 0): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo === Infinity) return [0, 1];
  if (lo === hi) return [lo - 0.5 * (Math.abs(lo) || 1), hi + 0.5 * (Math.abs(hi) || 1)];
  const span = hi - lo;
  return [lo - pad * span, hi + pad * span];
}
