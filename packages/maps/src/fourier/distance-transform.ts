/**
 * Exact Euclidean distance transform of a binary mask (Felzenszwalb & Huttenlocher 2012, Theory of
 * Computing 8, 415, "Distance transforms of sampled functions", Algorithm 1 (the lower envelope of
 * parabolas), applied along columns and then rows, sec. 2.2). O(nx·ny).
 */
import { UmbraError } from "@umbra/core";

/** One 1-D squared distance transform d[q] = min_p ((q − p)² + f[p]) over finite f; work arrays are reused. */
function edt1d(f: Float64Array, n: number, d: Float64Array, v: Int32Array, z: Float64Array, edge: boolean): void {
  let k = -1;
  for (let q = 0; q < n; q++) {
    const fq = f[q] as number;
    if (fq === Infinity) continue;
    if (k < 0) {
      k = 0;
      v[0] = q;
      z[0] = -Infinity;
      z[1] = Infinity;
      continue;
    }
    // z[0] = −∞ stops the pop loop at k = 0
    const hq = fq + q * q;
    let p = v[k] as number;
    let s = (hq - ((f[p] as number) + p * p)) / (2 * (q - p));
    while (s <= (z[k] as number)) {
      k--;
      p = v[k] as number;
      s = (hq - ((f[p] as number) + p * p)) / (2 * (q - p));
    }
    k++;
    v[k] = q;
    z[k] = s;
    z[k + 1] = Infinity;
  }
  if (k < 0) {
    for (let q = 0; q < n; q++) d[q] = edge ? Math.min((q + 1) * (q + 1), (n - q) * (n - q)) : Infinity;
    return;
  }
  let j = 0;
  for (let q = 0; q < n; q++) {
    while ((z[j + 1] as number) < q) j++;
    const p = v[j] as number;
    let best = (q - p) * (q - p) + (f[p] as number);
    if (edge) best = Math.min(best, (q + 1) * (q + 1), (n - q) * (n - q));
    d[q] = best;
  }
}

/**
 * Distance in pixels from each pixel centre to the nearest removed pixel centre, where a pixel is
 * removed when `mask[i]` is 0 or NaN (kept otherwise); removed pixels get 0. With `edgeAsRemoved`
 * the ring of pixels just outside the map counts as removed too (so no kept pixel is farther than
 * its distance to the map border + 1). Without it, a mask with no removed pixel gives Infinity.
 */
export function distanceToRemoved(mask: ArrayLike<number>, nx: number, ny: number, edgeAsRemoved = false): Float64Array {
  if (!Number.isInteger(nx) || !Number.isInteger(ny) || nx < 1 || ny < 1) {
    throw new UmbraError("BAD_VALUE", `mask size ${nx}×${ny} must be positive integers`, { field: "mask" });
  }
  if (mask.length !== nx * ny) throw new UmbraError("BAD_VALUE", `mask has ${mask.length} pixels, expected ${nx}×${ny}`, { field: "mask" });
  const n = Math.max(nx, ny);
  const f = new Float64Array(n);
  const d = new Float64Array(n);
  const v = new Int32Array(n);
  const z = new Float64Array(n + 1);
  const g = new Float64Array(nx * ny);
  for (let x = 0; x < nx; x++) {
    for (let y = 0; y < ny; y++) {
      const m = mask[y * nx + x] as number;
      f[y] = m === 0 || Number.isNaN(m) ? 0 : Infinity;
    }
    edt1d(f, ny, d, v, z, edgeAsRemoved);
    for (let y = 0; y < ny; y++) g[y * nx + x] = d[y] as number;
  }
  for (let y = 0; y < ny; y++) {
    const row = y * nx;
    for (let x = 0; x < nx; x++) f[x] = g[row + x] as number;
    edt1d(f, nx, d, v, z, edgeAsRemoved);
    for (let x = 0; x < nx; x++) g[row + x] = Math.sqrt(d[x] as number);
  }
  return g;
}
