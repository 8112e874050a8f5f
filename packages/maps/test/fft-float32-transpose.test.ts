/**
 * The float32 plan's wasm transposes (wasm-transpose.ts, running on PFFFT's memory) against their
 * definition (index arithmetic, common practice, no source) and against the JS transposes: the
 * two float32 paths must give identical numbers (both are checked against numpy in
 * fft-float32.test.ts).
 */
import { describe, expect, it } from "vitest";
import { createFloat32Plan } from "../src/fourier/rfft2-f32.js";
import { makeTransposer } from "../src/fourier/wasm-transpose.js";

const Memory = (globalThis as unknown as { WebAssembly: { Memory: new (d: { initial: number }) => { buffer: ArrayBuffer } } }).WebAssembly.Memory;

describe("wasm transposes of complex float32 pairs", () => {
  it("fwdT puts pair (y, k) of the rows at (k, y) of the columns, invT brings it back times the scale (rounded as a Float32Array store)", () => {
    const mem = new Memory({ initial: 1 });
    const t = makeTransposer(mem);
    expect(t).not.toBeNull();
    const half = 32;
    const ny = 16;
    const f = new Float32Array(mem.buffer);
    const a = 0; // bytes
    const b = 8 * half * ny;
    const scalePtr = 2 * b;
    for (let y = 0; y < ny; y++) {
      for (let k = 0; k < half; k++) {
        f[2 * (y * half + k)] = 1000 * y + k + 0.1;
        f[2 * (y * half + k) + 1] = -(1000 * y + k) - 0.7;
      }
    }
    t?.fwdT(a, b, half, ny);
    const cols = new Float32Array(mem.buffer, b, 2 * half * ny);
    for (let k = 0; k < half; k++) {
      for (let y = 0; y < ny; y++) {
        expect([cols[2 * (k * ny + y)], cols[2 * (k * ny + y) + 1]]).toEqual([Math.fround(1000 * y + k + 0.1), Math.fround(-(1000 * y + k) - 0.7)]);
      }
    }
    const s = 1 / 3;
    new Float64Array(mem.buffer, scalePtr, 1)[0] = s;
    f.fill(0, 0, 2 * half * ny);
    t?.invT(b, a, half, ny, scalePtr);
    const expected = new Float32Array(2 * half * ny);
    for (let y = 0; y < ny; y++) {
      for (let k = 0; k < half; k++) {
        expected[2 * (y * half + k)] = Math.fround(1000 * y + k + 0.1) * s;
        expected[2 * (y * half + k) + 1] = Math.fround(-(1000 * y + k) - 0.7) * s;
      }
    }
    expect(f.subarray(0, 2 * half * ny)).toAllClose(expected, { rtol: 0, atol: 0 });
  });
});

describe("float32 plan with wasm or JS transposes", () => {
  for (const [nx, ny] of [
    [32, 16],
    [64, 48],
    [160, 144],
    [96, 240],
  ] as const) {
    it(`${nx}×${ny}: both give the same spectrum and the same inverse, bit for bit`, async () => {
      const w = await createFloat32Plan(nx, ny, true);
      const j = await createFloat32Plan(nx, ny, false);
      // the plan did get hold of PFFFT's memory (else both would run the JS transposes)
      expect((w as unknown as { transposer: unknown }).transposer).not.toBeNull();
      expect((j as unknown as { transposer: unknown }).transposer).toBeNull();
      try {
        const map = Float32Array.from({ length: nx * ny }, (_, i) => Math.sin(0.37 * i) + (i % 5));
        const sw = new Float32Array(w.layout.spectrumLength);
        const sj = new Float32Array(j.layout.spectrumLength);
        w.forward(map, sw);
        j.forward(map, sj);
        expect(sw).toAllClose(sj, { rtol: 0, atol: 0 });
        const bw = new Float32Array(nx * ny);
        const bj = new Float32Array(nx * ny);
        w.inverse(sj, bw);
        j.inverse(sj, bj);
        expect(bw).toAllClose(bj, { rtol: 0, atol: 0 });
      } finally {
        w.dispose();
        j.dispose();
      }
    });
  }
});
