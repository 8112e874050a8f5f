/**
 * The float64 plan against numpy's rfft2 / irfft2 (reference values made by
 * fixtures/fourier/make_reference.py; the library version is recorded in the JSON).
 * Tolerance: 1e-12 of the largest |value| of each spectrum / map (numpy uses pocketfft, whose
 * float64 error is ~1e-16·log n; ours is of the same order).
 */
import { describe, expect, it } from "vitest";
import { getRfft2Plan } from "../src/fourier/index.js";
import { maxAbs, ref, toLayout } from "./fft-fixtures.js";

describe(`float64 rfft2 plan against ${ref.library}`, () => {
  for (const c of ref.cases) {
    it(`forward ${c.nx}×${c.ny} matches numpy.fft.rfft2 to 1e-12 of the spectrum maximum`, () => {
      const plan = getRfft2Plan(c.nx, c.ny);
      const spec = new Float64Array(plan.layout.spectrumLength);
      const map = Float64Array.from(c.map);
      plan.forward(map, spec);
      const expected = toLayout(c.spectrum, plan.layout);
      expect(spec).toAllClose(expected, { rtol: 0, atol: 1e-12 * maxAbs(expected) });
      expect(map).toAllClose(Float64Array.from(c.map), { rtol: 0, atol: 0 });
    });
    it(`inverse ${c.nx}×${c.ny} of an arbitrary half spectrum matches numpy.fft.irfft2`, () => {
      const plan = getRfft2Plan(c.nx, c.ny);
      const spec = toLayout(c.halfSpectrum, plan.layout);
      const copy = spec.slice();
      const out = new Float64Array(c.nx * c.ny);
      plan.inverse(spec, out);
      expect(out).toAllClose(Float64Array.from(c.inverse), { rtol: 0, atol: 1e-12 * maxAbs(c.inverse) });
      expect(spec).toAllClose(copy, { rtol: 0, atol: 0 });
    });
  }
});
