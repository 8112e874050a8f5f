/**
 * Phase factors of the shift theorem on one axis, in the layout's frequency convention: moving a
 * map by s pixels along an axis of n pixels multiplies mode k by exp(−2πi f_k s / n) (the forward
 * transform of ./types.ts), with f_k the signed frequency index of the stored mode. Tables are
 * separable, so a 2-D shift costs one complex product per mode.
 */

/**
 * Fill `out` (interleaved re, im) with exp(sign · 2πi f_k s / n) for the modes of one axis:
 * `axis: "half"` — the stored x half axis, k = 0 … floor(n/2), f_k = k (the layout's kxIndex);
 * `axis: "full"` — the y axis, k = 0 … n−1, f_k = k for k < (n+1)/2 and k − n above (numpy's
 * fftfreq·n, the layout's kyIndex taken modulo n). sign = −1 shifts a template to position s;
 * +1 is its conjugate (correlating data with a template at s). Returns `out`.
 */
export function shiftPhases(n: number, shiftPix: number, sign: 1 | -1, axis: "half" | "full", out: Float64Array): Float64Array {
  const count = axis === "half" ? (n >> 1) + 1 : n;
  const half = (n + 1) >> 1;
  for (let k = 0; k < count; k++) {
    const f = axis === "half" || k < half ? k : k - n;
    const a = (sign * 2 * Math.PI * f * shiftPix) / n; // this operation order keeps simulated maps bit-identical to earlier releases
    out[2 * k] = Math.cos(a);
    out[2 * k + 1] = Math.sin(a);
  }
  return out;
}
