/**
 * The opt-in float32 plan (PFFFT in wasm) against numpy's float64 rfft2 / irfft2 (fixture of
 * fixtures/fourier/make_reference.py) to 5e-7 of the maximum, and against our float64 plan on
 * larger shapes; size validation happens before wasm sees a size.
 */
import { describe, expect, it } from "vitest";
import { createRng, isUmbraError } from "@umbra/core";
import { createRfft2PlanFloat32, float32SizeProblem, getRfft2Plan } from "../src/fourier/index.js";
import { maxAbs, ref, toLayout } from "./fft-fixtures.js";

describe(`float32 plan against ${ref.library}`, () => {
  const cases = ref.cases.filter((c) => float32SizeProblem(c.nx, c.ny) === null);
  it("has fixture shapes the float32 path accepts", () => {
    expect(cases.length).toBeGreaterThanOrEqual(2);
  });
  for (const c of cases) {
    it(`forward and inverse ${c.nx}×${c.ny} match numpy to 5e-7 of the maximum`, async () => {
      const plan = await createRfft2PlanFloat32(c.nx, c.ny);
      try {
        const spec = new Float32Array(plan.layout.spectrumLength);
        plan.forward(Float32Array.from(c.map), spec);
        const expected = toLayout(c.spectrum, plan.layout);
        expect(spec).toAllClose(expected, { rtol: 0, atol: 5e-7 * maxAbs(expected) });
        const half = Float32Array.from(toLayout(c.halfSpectrum, plan.layout));
        const copy = half.slice();
        const out = new Float32Array(c.nx * c.ny);
        plan.inverse(half, out);
        expect(out).toAllClose(c.inverse, { rtol: 0, atol: 5e-7 * maxAbs(c.inverse) });
        expect(half).toAllClose(copy, { rtol: 0, atol: 0 });
      } finally {
        plan.dispose();
      }
    });
  }

  it("agrees with the float64 plan on 160×144 and 96×240 maps to 5e-7 of the maximum", async () => {
    for (const [nx, ny] of [
      [160, 144],
      [96, 240],
    ] as const) {
      const map = new Float64Array(nx * ny);
      createRng(nx + ny).fillNormal(map);
      const p64 = getRfft2Plan(nx, ny);
      const s64 = new Float64Array(p64.layout.spectrumLength);
      p64.forward(Float64Array.from(Float32Array.from(map)), s64);
      const p32 = await createRfft2PlanFloat32(nx, ny);
      const s32 = new Float32Array(p32.layout.spectrumLength);
      p32.forward(Float32Array.from(map), s32);
      // the two plans may store modes in different orders: compare mode by mode through the layouts
      const s64InF32Order = new Float64Array(s32.length);
      const where = new Map<string, number>();
      for (let m = 0; m < p64.layout.modeCount; m++) where.set(`${p64.layout.kxIndex[m]},${p64.layout.kyIndex[m]}`, m);
      for (let m = 0; m < p32.layout.modeCount; m++) {
        const m64 = where.get(`${p32.layout.kxIndex[m]},${p32.layout.kyIndex[m]}`) as number;
        s64InF32Order[2 * m] = s64[2 * m64] as number;
        s64InF32Order[2 * m + 1] = s64[2 * m64 + 1] as number;
      }
      expect(s32).toAllClose(s64InF32Order, { rtol: 0, atol: 5e-7 * maxAbs(s64) });
      const back = new Float32Array(nx * ny);
      p32.inverse(s32, back);
      expect(back).toAllClose(map, { rtol: 0, atol: 5e-7 * maxAbs(map) });
      p32.dispose();
    }
  });

  it("rejects shapes PFFFT cannot take with BAD_OPTION before touching wasm", async () => {
    for (const [nx, ny] of [
      [900, 600],
      [48, 32], // 48 is not a multiple of 32
      [64, 8],
      [224, 32], // 224 = 32·7 is not 5-smooth
    ] as const) {
      let err: unknown = null;
      try {
        await createRfft2PlanFloat32(nx, ny);
      } catch (e) {
        err = e;
      }
      expect(isUmbraError(err, "BAD_OPTION")).toBe(true);
    }
  });

  it("refuses to run after dispose", async () => {
    const plan = await createRfft2PlanFloat32(32, 16);
    plan.dispose();
    expect(() => plan.forward(new Float32Array(512), new Float32Array(plan.layout.spectrumLength))).toThrow(/disposed/);
  });
});
