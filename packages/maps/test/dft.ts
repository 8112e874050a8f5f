/** Test helper: the direct O(n²) discrete Fourier transform, the independent reference for FFT kernels. */

/**
 * DFT of `n` interleaved complex values: X_k = Σ_j x_j exp(dir·2πi jk/n) (unnormalised; dir −1 is
 * numpy's forward convention). Common practice, no source.
 */
export function naiveDft(x: Float64Array, dir: 1 | -1, n = x.length / 2): Float64Array {
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    let sr = 0;
    let si = 0;
    for (let j = 0; j < n; j++) {
      const theta = (dir * 2 * Math.PI * ((j * k) % n)) / n;
      const c = Math.cos(theta);
      const s = Math.sin(theta);
      sr += (x[2 * j] as number) * c - (x[2 * j + 1] as number) * s;
      si += (x[2 * j] as number) * s + (x[2 * j + 1] as number) * c;
    }
    out[2 * k] = sr;
    out[2 * k + 1] = si;
  }
  return out;
}
