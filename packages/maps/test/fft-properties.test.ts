/**
 * Identities the 2-D transform must satisfy for any shape (fast-check property tests): round trip,
 * linearity, Parseval with the layout's Hermitian weights, and the shift theorem (definitions of
 * the DFT; common practice, no source). Sizes 1…40 cover radix-2/3/4/5 and Bluestein lengths.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createRng } from "@umbra/core";
import { getRfft2Plan } from "../src/fourier/index.js";
import { UmbraError } from "@umbra/core";

const size = fc.integer({ min: 1, max: 40 });

function randomMap(nx: number, ny: number, seed: number): Float64Array {
  const m = new Float64Array(nx * ny);
  createRng(seed).fillNormal(m);
  return m;
}

function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] as number));
  return m;
}

describe("rfft2 identities", () => {
  it("inverse(forward(f)) returns f to 1e-13 of its maximum", () => {
    fc.assert(
      fc.property(size, size, fc.integer(), (nx, ny, seed) => {
        const plan = getRfft2Plan(nx, ny);
        const f = randomMap(nx, ny, seed);
        const spec = new Float64Array(plan.layout.spectrumLength);
        const back = new Float64Array(nx * ny);
        plan.forward(f, spec);
        plan.inverse(spec, back);
        expect(back).toAllClose(f, { rtol: 0, atol: 1e-13 * maxAbs(f) });
      }),
      { numRuns: 60 },
    );
  });

  it("is linear: F(a·f + b·g) = a·F(f) + b·F(g)", () => {
    fc.assert(
      fc.property(size, size, fc.integer(), fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: -10, max: 10, noNaN: true }), (nx, ny, seed, a, b) => {
        const plan = getRfft2Plan(nx, ny);
        const f = randomMap(nx, ny, seed);
        const g = randomMap(nx, ny, seed + 1);
        const h = f.map((v, i) => a * v + b * (g[i] as number));
        const L = plan.layout.spectrumLength;
        const sf = new Float64Array(L);
        const sg = new Float64Array(L);
        const sh = new Float64Array(L);
        plan.forward(f, sf);
        plan.forward(g, sg);
        plan.forward(h, sh);
        const expected = sf.map((v, i) => a * v + b * (sg[i] as number));
        expect(sh).toAllClose(expected, { rtol: 0, atol: 1e-12 * (maxAbs(expected) + 1) });
      }),
      { numRuns: 40 },
    );
  });

  it("obeys Parseval with the Hermitian weights: Σ w|F|² = nx·ny·Σ f²", () => {
    fc.assert(
      fc.property(size, size, fc.integer(), (nx, ny, seed) => {
        const plan = getRfft2Plan(nx, ny);
        const f = randomMap(nx, ny, seed);
        const spec = new Float64Array(plan.layout.spectrumLength);
        plan.forward(f, spec);
        let lhs = 0;
        for (let m = 0; m < plan.layout.modeCount; m++) {
          lhs += (plan.layout.hermitianWeight[m] as number) * ((spec[2 * m] as number) ** 2 + (spec[2 * m + 1] as number) ** 2);
        }
        let rhs = 0;
        for (const v of f) rhs += v * v;
        expect(lhs).toAllClose(nx * ny * rhs, { rtol: 1e-12 });
      }),
      { numRuns: 60 },
    );
  });

  it("obeys the shift theorem: f(x − sx, y − sy) ↦ F·exp(−2πi(kx·sx/nx + ky·sy/ny))", () => {
    fc.assert(
      fc.property(size, size, fc.nat(), fc.nat(), fc.integer(), (nx, ny, sxRaw, syRaw, seed) => {
        const sx = sxRaw % nx;
        const sy = syRaw % ny;
        const plan = getRfft2Plan(nx, ny);
        const f = randomMap(nx, ny, seed);
        const g = new Float64Array(nx * ny);
        for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) g[((y + sy) % ny) * nx + ((x + sx) % nx)] = f[y * nx + x] as number;
        const L = plan.layout.spectrumLength;
        const sf = new Float64Array(L);
        const sg = new Float64Array(L);
        plan.forward(f, sf);
        plan.forward(g, sg);
        const expected = new Float64Array(L);
        for (let m = 0; m < plan.layout.modeCount; m++) {
          const kx = plan.layout.kxIndex[m] as number;
          const ky = plan.layout.kyIndex[m] as number;
          const phase = -2 * Math.PI * (((kx * sx) % nx) / nx + ((((ky * sy) % ny) + ny) % ny) / ny);
          const c = Math.cos(phase);
          const s = Math.sin(phase);
          expected[2 * m] = (sf[2 * m] as number) * c - (sf[2 * m + 1] as number) * s;
          expected[2 * m + 1] = (sf[2 * m] as number) * s + (sf[2 * m + 1] as number) * c;
        }
        expect(sg).toAllClose(expected, { rtol: 0, atol: 1e-12 * maxAbs(expected) });
      }),
      { numRuns: 40 },
    );
  });

  it("has a layout with ny·(floor(nx/2)+1) modes, each (kx, ky) once, weights summing to nx·ny", () => {
    fc.assert(
      fc.property(size, size, (nx, ny) => {
        const layout = getRfft2Plan(nx, ny).layout;
        expect(layout.modeCount).toBe(ny * (Math.floor(nx / 2) + 1));
        expect(layout.spectrumLength).toBe(2 * layout.modeCount);
        const seen = new Set<string>();
        let wsum = 0;
        for (let m = 0; m < layout.modeCount; m++) {
          const kx = layout.kxIndex[m] as number;
          const ky = layout.kyIndex[m] as number;
          expect(kx >= 0 && kx <= nx / 2 && ky >= -ny / 2 && ky < ny / 2 + 0.5).toBe(true);
          seen.add(`${kx},${ky}`);
          wsum += layout.hermitianWeight[m] as number;
        }
        expect(seen.size).toBe(layout.modeCount);
        expect(wsum).toBe(nx * ny);
      }),
      { numRuns: 60 },
    );
  });

  it("rejects bad sizes and wrong buffer lengths with a typed BAD_VALUE error", () => {
    expect(() => getRfft2Plan(0, 4)).toThrow(UmbraError);
    expect(() => getRfft2Plan(3.5, 4)).toThrow(/nx/);
    const plan = getRfft2Plan(8, 6);
    expect(() => plan.forward(new Float64Array(47), new Float64Array(plan.layout.spectrumLength))).toThrow(/map has length 47/);
    expect(() => plan.inverse(new Float64Array(3), new Float64Array(48))).toThrow(/spectrum/);
  });

  for (const [nx, ny] of [
    [1009, 3], // prime row length: Bluestein with lanes
    [1000, 2], // 5-smooth, radices 4, 2, 5, 5, 5
    [3, 1013], // prime column length
  ] as const) {
    it(`forward ${nx}×${ny} matches a direct 2-D DFT to 1e-12 of the maximum`, () => {
      const f = randomMap(nx, ny, nx + ny);
      const plan = getRfft2Plan(nx, ny);
      const spec = new Float64Array(plan.layout.spectrumLength);
      plan.forward(f, spec);
      const expected = new Float64Array(plan.layout.spectrumLength);
      for (let m = 0; m < plan.layout.modeCount; m++) {
        const kx = plan.layout.kxIndex[m] as number;
        const ky = plan.layout.kyIndex[m] as number;
        let re = 0;
        let im = 0;
        for (let y = 0; y < ny; y++) {
          for (let x = 0; x < nx; x++) {
            // exact angle reduction: (kx·x mod nx)/nx + (ky·y mod ny)/ny
            const phase = -2 * Math.PI * (((kx * x) % nx) / nx + ((((ky * y) % ny) + ny) % ny) / ny);
            const v = f[y * nx + x] as number;
            re += v * Math.cos(phase);
            im += v * Math.sin(phase);
          }
        }
        expected[2 * m] = re;
        expected[2 * m + 1] = im;
      }
      expect(spec).toAllClose(expected, { rtol: 0, atol: 1e-12 * maxAbs(expected) });
      const back = new Float64Array(nx * ny);
      plan.inverse(spec, back);
      expect(back).toAllClose(f, { rtol: 0, atol: 1e-13 * maxAbs(f) });
    });
  }

  it("returns the same cached plan for the same shape", () => {
    expect(getRfft2Plan(12, 10)).toBe(getRfft2Plan(12, 10));
  });
});
