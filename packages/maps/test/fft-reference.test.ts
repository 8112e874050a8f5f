/**
 * The float64 plan against numpy's rfft2 / irfft2 (reference values made by
 * fixtures/fourier/make_reference.py; the library version is recorded in the JSON).
 * Tolerance: 1e-12 of the largest |value| of each spectrum / map (numpy uses pocketfft, whose
 * float64 error is ~1e-16·log n; ours is of the same order).
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { getRfft2Plan } from "../src/fourier/index.js";
import type { SpectrumLayout } from "../src/fourier/types.js";

interface Case {
  nx: number;
  ny: number;
  map: number[];
  spectrum: number[];
  halfSpectrum: number[];
  inverse: number[];
}
const ref = JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/fourier/rfft2_reference.json", import.meta.url)), "utf8")) as {
  library: string;
  cases: Case[];
};

/** Reorder a numpy-ordered (ky_row, kx) half spectrum into the plan's layout via the layout arrays. */
function toLayout(numpyHalf: ArrayLike<number>, layout: SpectrumLayout): Float64Array {
  const nh = Math.floor(layout.nx / 2) + 1;
  const out = new Float64Array(layout.spectrumLength);
  for (let m = 0; m < layout.modeCount; m++) {
    const row = ((layout.kyIndex[m] as number) + layout.ny) % layout.ny;
    const i = 2 * (row * nh + (layout.kxIndex[m] as number));
    out[2 * m] = numpyHalf[i] as number;
    out[2 * m + 1] = numpyHalf[i + 1] as number;
  }
  return out;
}

function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] as number));
  return m;
}

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
