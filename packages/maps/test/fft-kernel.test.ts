/**
 * The 1-D complex kernels (mixed radix, Bluestein) against a direct O(n²) DFT evaluated with
 * exactly reduced angles (definition of the DFT; common practice, no source).
 */
import { describe, expect, it } from "vitest";
import { makeComplexFft } from "../src/fourier/bluestein.js";
import { nextSmooth, smoothRadices } from "../src/fourier/mixed-radix.js";
import { createRng } from "@umbra/core";
import { naiveDft } from "./dft.js";

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
