import { describe, expect, it } from "vitest";
import { createRng } from "@umbra/core";
import { getRfft2Plan, shiftPhases } from "../src/fourier/index.js";

describe("shiftPhases", () => {
  it("uses the layout's signed frequencies (numpy fftfreq order on the full axis, 0…n/2 on the half axis)", () => {
    const half = shiftPhases(8, 0.25, -1, "half", new Float64Array(10));
    const full = shiftPhases(8, 0.25, -1, "full", new Float64Array(16));
    // f = 4 on the half axis, f = −4 on the full axis (numpy.fft.fftfreq(8)*8 ends … 3, −4, −3 …; from memory)
    expect([half[8]!, half[9]!]).toAllClose([Math.cos((-2 * Math.PI * 4 * 0.25) / 8), Math.sin((-2 * Math.PI * 4 * 0.25) / 8)], { rtol: 1e-15, atol: 1e-16 });
    expect([full[8]!, full[9]!]).toAllClose([Math.cos((2 * Math.PI * 4 * 0.25) / 8), Math.sin((2 * Math.PI * 4 * 0.25) / 8)], { rtol: 1e-15, atol: 1e-16 });
  });
  it("shifts a map by whole pixels exactly, as the shift theorem says (common practice)", () => {
    const nx = 12, ny = 10, sx = 3, sy = -2;
    const plan = getRfft2Plan(nx, ny);
    const rng = createRng(4);
    const map = rng.fillNormal(new Float64Array(nx * ny)) as Float64Array;
    const spec = new Float64Array(plan.layout.spectrumLength);
    plan.forward(map, spec);
    const ex = shiftPhases(nx, sx, -1, "half", new Float64Array(2 * nx));
    const ey = shiftPhases(ny, sy, -1, "full", new Float64Array(2 * ny));
    const { kxIndex, kyIndex, modeCount } = plan.layout;
    for (let m = 0; m < modeCount; m++) {
      const kx = kxIndex[m]!;
      const ky = (kyIndex[m]! + ny) % ny;
      const pr = ex[2 * kx]! * ey[2 * ky]! - ex[2 * kx + 1]! * ey[2 * ky + 1]!;
      const pi = ex[2 * kx]! * ey[2 * ky + 1]! + ex[2 * kx + 1]! * ey[2 * ky]!;
      const re = spec[2 * m]!, im = spec[2 * m + 1]!;
      spec[2 * m] = re * pr - im * pi;
      spec[2 * m + 1] = re * pi + im * pr;
    }
    const out = new Float64Array(nx * ny);
    plan.inverse(spec, out);
    const expected = new Float64Array(nx * ny);
    for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) expected[((y + sy + ny) % ny) * nx + ((x + sx) % nx)] = map[y * nx + x]!;
    expect(out).toAllClose(expected, { rtol: 0, atol: 1e-12 });
  });
});
