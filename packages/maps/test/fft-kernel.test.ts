/**
 * The 1-D complex kernels (mixed radix, Bluestein) against a direct O(n²) DFT evaluated with
 * exactly reduced angles (definition of the DFT; common practice, no source).
 */
import { describe, expect, it } from "vitest";
import { makeComplexFft } from "../src/fourier/bluestein.js";
import { nextSmooth, smoothRadices } from "../src/fourier/mixed-radix.js";
import { createRng } from "@umbra/core";

function naiveDft(x: Float64Array, dir: 1 | -1): Float64Array {
  const n = x.length / 2;
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

describe("complex FFT kernels", () => {
  it("factor 5-smooth lengths into radices 4, 2, 3, 5 and reject the others", () => {
    expect(smoothRadices(600)).toEqual([4, 2, 3, 5, 5]);
    expect(smoothRadices(1)).toEqual([]);
    expect(smoothRadices(7)).toBeNull();
    expect(nextSmooth(1021)).toBe(1024);
    expect(nextSmooth(97)).toBe(100);
  });

  const lengths = [...Array.from({ length: 40 }, (_, i) => i + 1), 45, 60, 64, 97, 120, 125, 243, 256, 360, 389, 1000];
  for (const n of lengths) {
    it(`length ${n} matches the direct DFT both ways to 1e-12 of the maximum, in and out of place`, () => {
      const rng = createRng(n);
      const x = new Float64Array(2 * n);
      rng.fillNormal(x);
      const fft = makeComplexFft(n);
      for (const dir of [-1, 1] as const) {
        const expected = naiveDft(x, dir);
        let max = 0;
        for (const v of expected) max = Math.max(max, Math.abs(v));
        const y = new Float64Array(2 * n + 6);
        fft.transform(x, 0, y, 4, dir);
        expect(y.subarray(4, 4 + 2 * n)).toAllClose(expected, { rtol: 0, atol: 1e-12 * max });
        const inPlace = new Float64Array(2 * n + 2);
        inPlace.set(x, 2);
        fft.transform(inPlace, 2, inPlace, 2, dir);
        expect(inPlace.subarray(2)).toAllClose(expected, { rtol: 0, atol: 1e-12 * max });
      }
    });
  }
});
