/**
 * The WebAssembly SIMD kernel (wasm-lanes.ts, wasm-rows.ts, written by src/wasm/emit.ts): its LEB128
 * encoder against the DWARF examples, the batched kernel against the scalar JS kernel and a direct
 * DFT, and the float64 2-D plan with and without wasm against numpy's rfft2 / irfft2
 * (fixtures/fourier/rfft2_reference.json, made by fixtures/fourier/make_reference.py).
 */
import { describe, expect, it } from "vitest";
import { createRng } from "@umbra/core";
import { naiveDft } from "./dft.js";
import { MixedRadixLanes } from "../src/fourier/mixed-radix.js";
import { WasmLanes, laneModule } from "../src/fourier/wasm-lanes.js";
import { sleb, uleb } from "../src/wasm/emit.js";
import { Rfft2PlanF64 } from "../src/fourier/rfft2-f64.js";
import { maxAbs, ref, toLayout } from "./fft-fixtures.js";

describe("LEB128 encoding", () => {
  it("matches the unsigned and signed examples of the DWARF 4 standard (sec. 7.6, figures 22 and 23; from memory)", () => {
    expect([2, 127, 128, 129, 130, 12857].map(uleb)).toEqual([[2], [127], [0x80, 1], [0x81, 1], [0x82, 1], [0xb9, 0x64]]);
    expect([2, -2, 127, -127, 128, -128, 129, -129].map(sleb)).toEqual([[2], [0x7e], [0xff, 0], [0x81, 0x7f], [0x80, 1], [0x80, 0x7f], [0x81, 1], [0xff, 0x7e]]);
  });
});

describe("WebAssembly SIMD lane kernel", () => {
  it("is available on this Node (so the tests below exercise it)", () => {
    expect(laneModule()).not.toBeNull();
  });

  const lengths = [1, 2, 3, 4, 5, 6, 8, 9, 10, 12, 15, 16, 25, 27, 30, 32, 45, 48, 60, 64, 75, 100, 125, 128, 600, 900];
  for (const n of lengths) {
    it(`length ${n}: 3 lanes through strided src/dst match the JS kernel to 1e-14 and lane 1 the direct DFT to 1e-12 (both directions)`, () => {
      const L = 3;
      const rng = createRng(1000 + n);
      const src = new Float64Array(2 * (L + 1) * n + 8);
      rng.fillNormal(src);
      const js = new MixedRadixLanes(n, L);
      const wasm = new WasmLanes(n, L);
      for (const dir of [-1, 1] as const) {
        const a = new Float64Array(2 * (L + 2) * n + 6);
        const b = new Float64Array(2 * (L + 2) * n + 6);
        js.transform(src, 2, 2 * (L + 1), a, 6, 2 * (L + 2), L, dir);
        wasm.transform(src, 2, 2 * (L + 1), b, 6, 2 * (L + 2), L, dir);
        expect(b).toAllClose(a, { rtol: 0, atol: 1e-14 * maxAbs(a) });
        if (n <= 128) {
          const lane1 = new Float64Array(2 * n);
          const out1 = new Float64Array(2 * n);
          for (let i = 0; i < n; i++) {
            lane1[2 * i] = src[2 + i * 2 * (L + 1) + 2] as number;
            lane1[2 * i + 1] = src[2 + i * 2 * (L + 1) + 3] as number;
            out1[2 * i] = b[6 + i * 2 * (L + 2) + 2] as number;
            out1[2 * i + 1] = b[6 + i * 2 * (L + 2) + 3] as number;
          }
          const expected = naiveDft(lane1, dir, n);
          expect(out1).toAllClose(expected, { rtol: 0, atol: 1e-12 * maxAbs(expected) });
        }
      }
    });
  }

  it("transforms its own lane buffer in place (no copy) with the same result", () => {
    const n = 60;
    const L = 4;
    const wasm = new WasmLanes(n, L);
    const js = new MixedRadixLanes(n, L);
    const x = new Float64Array(2 * n * L);
    createRng(7).fillNormal(x);
    const expected = new Float64Array(2 * n * L);
    js.transform(x, 0, 2 * L, expected, 0, 2 * L, L, -1);
    const lanes = wasm.laneBuffer();
    lanes.set(x);
    wasm.transform(lanes, 0, 2 * L, lanes, 0, 2 * L, L, -1);
    expect(lanes.subarray(0, 2 * n * L)).toAllClose(expected, { rtol: 0, atol: 1e-14 * maxAbs(expected) });
  });
});

describe("float64 plan, wasm and JS kernels, against numpy", () => {
  // small lane budgets force several batches, partial batches and a lone last row
  for (const laneDoubles of [1 << 16, 40]) {
    for (const useWasm of [true, false]) {
      for (const c of ref.cases) {
        it(`${c.nx}×${c.ny} (${useWasm ? "wasm" : "JS"} kernel, ${laneDoubles} lane doubles): forward and inverse match rfft2 / irfft2 to 1e-12 of the maximum`, () => {
          const plan = new Rfft2PlanF64(c.nx, c.ny, laneDoubles, useWasm);
          const spec = new Float64Array(plan.layout.spectrumLength);
          plan.forward(Float64Array.from(c.map), spec);
          const expected = toLayout(c.spectrum, plan.layout);
          expect(spec).toAllClose(expected, { rtol: 0, atol: 1e-12 * maxAbs(expected) });
          const half = toLayout(c.halfSpectrum, plan.layout);
          const copy = half.slice();
          const out = new Float64Array(c.nx * c.ny).fill(Number.NaN);
          plan.inverse(half, out);
          expect(out).toAllClose(Float64Array.from(c.inverse), { rtol: 0, atol: 1e-12 * maxAbs(c.inverse) });
          expect(half).toAllClose(copy, { rtol: 0, atol: 0 });
        });
      }
    }
  }
});
