/** Timing helpers shared by the benchmarks. */

/** One benchmark result: what was timed, the median seconds per run, and a derived rate. */
export interface RateBenchRow {
  name: string;
  secondsPerRun: number;
  runs: number;
  /** Items per second where that makes sense (pairs, clusters, calls). */
  perSecond?: number;
  items?: number;
}

/** Median of a non-empty list. */
export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 === 1 ? (s[(n - 1) / 2] as number) : 0.5 * ((s[n / 2 - 1] as number) + (s[n / 2] as number));
}

/** Median wall-clock seconds of `runs` calls of `f`, after one warm-up call unless `warm` is false. */
export function timeRuns(runs: number, f: () => void, warm = true): number {
  if (warm) f();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    f();
    t.push((performance.now() - t0) / 1000);
  }
  return median(t);
}
