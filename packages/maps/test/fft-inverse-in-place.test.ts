/**
 * The float64 inverse works inside the output map (packed half rows, no full-size scratch) and the
 * layouts build their per-mode arrays only on first use. Reference values: numpy's irfft2 through
 * fixtures/fourier/rfft2_reference.json (made by fixtures/fourier/make_reference.py).
 */
import { describe, expect, it } from "vitest";
import { getRfft2Plan } from "../src/fourier/index.js";
import { Rfft2PlanF64 } from "../src/fourier/rfft2-f64.js";
import { makeRowMajorLayout, makeTransposedLayout } from "../src/fourier/layout.js";
import { maxAbs, ref, toLayout } from "./fft-fixtures.js";

describe("float64 inverse written through the output map", () => {
  for (const c of ref.cases) {
    it(`${c.nx}×${c.ny}: whatever the output map held before (NaN here) does not leak into numpy's irfft2 result`, () => {
      const plan = new Rfft2PlanF64(c.nx, c.ny);
      const spec = toLayout(c.halfSpectrum, plan.layout);
      const out = new Float64Array(c.nx * c.ny).fill(Number.NaN);
      plan.inverse(spec, out);
      expect(out).toAllClose(Float64Array.from(c.inverse), { rtol: 0, atol: 1e-12 * maxAbs(c.inverse) });
    });
  }

  it("a forward–inverse round trip into the map it came from gives the map back (6 bands in turn, one spectrum)", () => {
    const nx = 30;
    const ny = 20;
    const plan = getRfft2Plan(nx, ny);
    const spec = new Float64Array(plan.layout.spectrumLength);
    for (let b = 0; b < 6; b++) {
      const map = Float64Array.from({ length: nx * ny }, (_, i) => Math.sin(0.37 * i * (b + 1)) + b);
      const copy = map.slice();
      plan.forward(map, spec);
      plan.inverse(spec, map);
      expect(map).toAllClose(copy, { rtol: 0, atol: 1e-13 * maxAbs(copy) });
    }
  });
});

describe("lazily built layouts", () => {
  it("give the same per-mode arrays on every access, with the documented contents", () => {
    for (const layout of [makeRowMajorLayout(6, 4), makeTransposedLayout(6, 4)]) {
      const kx = layout.kxIndex;
      expect(layout.kxIndex).toBe(kx);
      expect(layout.kyIndex).toBe(layout.kyIndex);
      expect(layout.hermitianWeight).toBe(layout.hermitianWeight);
      expect(layout.modeCount).toBe(16);
      expect(layout.spectrumLength).toBe(32);
      const seen = new Set<string>();
      for (let m = 0; m < layout.modeCount; m++) {
        const ix = layout.kxIndex[m] as number;
        const iy = layout.kyIndex[m] as number;
        seen.add(`${ix},${iy}`);
        // numpy fftfreq(4)·4 = 0, 1, −2, −1; weight 1 at kx = 0 and kx = nx/2 = 3, else 2
        expect(iy >= -2 && iy <= 1).toBe(true);
        expect(layout.hermitianWeight[m]).toBe(ix === 0 || ix === 3 ? 1 : 2);
      }
      expect(seen.size).toBe(16);
    }
  });

  it("row-major and transposed orders are m = iy·nh + ix and m = ix·ny + iy", () => {
    const r = makeRowMajorLayout(5, 3);
    const t = makeTransposedLayout(5, 3);
    expect([r.kxIndex[4], r.kyIndex[4]]).toEqual([1, 1]);
    expect([t.kxIndex[4], t.kyIndex[4]]).toEqual([1, 1]);
    expect([r.kxIndex[8], r.kyIndex[8]]).toEqual([2, -1]);
    expect([t.kxIndex[8], t.kyIndex[8]]).toEqual([2, -1]);
  });
});
