/**
 * Interpolation of a row-major image at fractional 0-based pixel positions.
 *
 * - bilinear: the 2 × 2 neighbours weighted by (1 − t, t) per axis (common practice, no source);
 * - bicubic: the separable cubic convolution kernel of Keys 1981 (IEEE Trans. ASSP 29, 1153,
 *   eq. 15) with a = −1/2, which reproduces quadratics exactly and converges as h³:
 *   W(s) = 1.5|s|³ − 2.5|s|² + 1 for |s| ≤ 1; −0.5|s|³ + 2.5|s|² − 4|s| + 2 for 1 < |s| < 2; else 0.
 *
 * A position is covered when it lies within the outer pixel edges, −0.5 ≤ x ≤ n − 0.5; elsewhere the
 * result is NaN. Neighbours beyond the edge repeat the edge pixel. A NaN neighbour with a
 * non-zero weight makes the result NaN.
 */

/** Interpolation methods. */
export type InterpolationMethod = "bicubic" | "bilinear";

/** Keys (1981) cubic convolution kernel with a = −1/2 (eq. 15). */
export function keysKernel(s: number): number {
  const x = Math.abs(s);
  if (x <= 1) return (1.5 * x - 2.5) * x * x + 1;
  if (x < 2) return ((-0.5 * x + 2.5) * x - 4) * x + 2;
  return 0;
}

const clamp = (i: number, n: number): number => (i < 0 ? 0 : i >= n ? n - 1 : i);

/** Bilinear value of `data` (nx × ny, row-major) at 0-based (x, y); NaN when not covered. */
export function sampleBilinear(data: Float64Array, nx: number, ny: number, x: number, y: number): number {
  if (!(x >= -0.5 && x <= nx - 0.5 && y >= -0.5 && y <= ny - 0.5)) return NaN;
  const fx = Math.floor(x);
  const fy = Math.floor(y);
  const tx = x - fx;
  const ty = y - fy;
  const x0 = clamp(fx, nx);
  const x1 = clamp(fx + 1, nx);
  const y0 = clamp(fy, ny);
  const y1 = clamp(fy + 1, ny);
  const w00 = (1 - tx) * (1 - ty);
  const w10 = tx * (1 - ty);
  const w01 = (1 - tx) * ty;
  const w11 = tx * ty;
  let acc = 0;
  if (w00 !== 0) acc += w00 * (data[y0 * nx + x0] as number);
  if (w10 !== 0) acc += w10 * (data[y0 * nx + x1] as number);
  if (w01 !== 0) acc += w01 * (data[y1 * nx + x0] as number);
  if (w11 !== 0) acc += w11 * (data[y1 * nx + x1] as number);
  return acc;
}

/** Keys bicubic value of `data` (nx × ny, row-major) at 0-based (x, y); NaN when not covered. */
export function sampleBicubic(data: Float64Array, nx: number, ny: number, x: number, y: number): number {
  if (!(x >= -0.5 && x <= nx - 0.5 && y >= -0.5 && y <= ny - 0.5)) return NaN;
  const fx = Math.floor(x);
  const fy = Math.floor(y);
  const tx = x - fx;
  const ty = y - fy;
  const wx0 = keysKernel(1 + tx);
  const wx1 = keysKernel(tx);
  const wx2 = keysKernel(1 - tx);
  const wx3 = keysKernel(2 - tx);
  const i0 = clamp(fx - 1, nx);
  const i1 = clamp(fx, nx);
  const i2 = clamp(fx + 1, nx);
  const i3 = clamp(fx + 2, nx);
  let acc = 0;
  for (let k = -1; k <= 2; k++) {
    const wy = keysKernel(k - ty);
    if (wy === 0) continue;
    const row = clamp(fy + k, ny) * nx;
    let r = 0;
    if (wx0 !== 0) r += wx0 * (data[row + i0] as number);
    if (wx1 !== 0) r += wx1 * (data[row + i1] as number);
    if (wx2 !== 0) r += wx2 * (data[row + i2] as number);
    if (wx3 !== 0) r += wx3 * (data[row + i3] as number);
    acc += wy * r;
  }
  return acc;
}
