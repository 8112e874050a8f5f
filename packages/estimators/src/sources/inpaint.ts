/**
 * Harmonic inpainting of masked pixels: the masked values are replaced by the solution of
 * Laplace's equation with the surrounding valid pixels as boundary values (each masked pixel equal
 * to the mean of its 4 neighbours), solved by successive over-relaxation (Press et al. 2007,
 * Numerical Recipes 3rd ed., sec. 20.5.1). A masked bright point source is thereby replaced by a
 * smooth interpolation of its surroundings instead of a hole: holes would leak large-scale CMB and
 * atmospheric power into cluster scales through the mask's edges.
 */
import { UmbraError } from "@umbra/core";

/** Options of {@link inpaintHarmonic}. */
export interface InpaintOptions {
  /** Over-relaxation factor ω in (0, 2) (default 1.9). */
  readonly omega?: number;
  /** Largest number of sweeps (default 2000). */
  readonly maxSweeps?: number;
  /** Stop when the largest change in a sweep is below tol·(rms of the valid pixels) (default 1e-6). */
  readonly tol?: number;
}

/**
 * Inpaint `map` (nx × ny, row-major) in place where `bad[p]` is 1. Returns the number of sweeps.
 * Throws BAD_DATA when every pixel is bad.
 */
export function inpaintHarmonic(map: Float64Array, bad: Uint8Array, nx: number, ny: number, opts: InpaintOptions = {}): number {
  const omega = opts.omega ?? 1.9;
  const maxSweeps = opts.maxSweeps ?? 2000;
  const tol = opts.tol ?? 1e-6;
  const idx: number[] = [];
  let sum = 0;
  let sum2 = 0;
  let nGood = 0;
  for (let p = 0; p < map.length; p++) {
    if (bad[p] === 1) idx.push(p);
    else {
      const v = map[p] as number;
      sum += v;
      sum2 += v * v;
      nGood++;
    }
  }
  if (idx.length === 0) return 0;
  if (nGood === 0) throw new UmbraError("BAD_DATA", "every pixel is masked or missing: nothing to inpaint from");
  const mean = sum / nGood;
  const rms = Math.sqrt(Math.max(sum2 / nGood - mean * mean, 0)) || 1;
  for (const p of idx) map[p] = mean;
  let sweep = 0;
  for (; sweep < maxSweeps; sweep++) {
    let maxChange = 0;
    for (const p of idx) {
      const x = p % nx;
      const y = (p - x) / nx;
      let s = 0;
      let n = 0;
      if (x > 0) { s += map[p - 1] as number; n++; }
      if (x < nx - 1) { s += map[p + 1] as number; n++; }
      if (y > 0) { s += map[p - nx] as number; n++; }
      if (y < ny - 1) { s += map[p + nx] as number; n++; }
      const old = map[p] as number;
      const next = old + omega * (s / n - old);
      map[p] = next;
      const c = Math.abs(next - old);
      if (c > maxChange) maxChange = c;
    }
    if (maxChange < tol * rms) break;
  }
  return sweep + 1;
}
