import { describe, expect, it } from "vitest";
import { betaModel, fourierShape, fourierShapeAt, fourierShapeLookup, gnfwA10, profileFourierAtEll, templateAreaOverY0, type PressureProfile } from "../src/index.js";
import { REFERENCE } from "./reference.js";

describe("profile Fourier (Hankel) transform", () => {
  it("a 3-D Gaussian gives F̃(q) = 2πσ² exp(−q²σ²/2) (closed form) to 1e-8 of the peak", () => {
    const sigma = 0.3;
    const gauss: PressureProfile = { label: "gauss", cuspSlope: 0, key: "test-gauss-0.3", pressureRatio: (r) => Math.exp((-r * r) / (2 * sigma * sigma)) };
    const peak = 2 * Math.PI * sigma * sigma;
    for (const q of [0, 0.5, 2, 5, 10, 20]) {
      expect(fourierShapeAt(gauss, q, 5)).toAllClose(peak * Math.exp((-q * q * sigma * sigma) / 2), { atol: 1e-8 * peak });
    }
  });

  it("a truncated β = 2/3 model matches scipy's Hankel transform of its closed-form projection to 1e-6 of the peak", () => {
    const ref = REFERENCE.beta_fourier;
    const prof = betaModel({ coreRadiusR500: ref.xc, beta: 2 / 3 });
    const peak = ref.fourier[0]!;
    const direct = ref.q.map((q) => fourierShapeAt(prof, q, ref.truncation));
    expect(direct).toAllClose(ref.fourier, { atol: 1e-6 * peak });
    const table = fourierShape(prof, { truncation: ref.truncation });
    expect(ref.q.map((q) => fourierShapeLookup(table, q))).toAllClose(ref.fourier, { atol: 1e-4 * peak });
  });

  it("the table reproduces direct quadrature to 1e-4 of the peak for A10 over q = 1e-3 … 5e3 (the tail beyond q = 1000 is a power law)", () => {
    const a10 = gnfwA10();
    const table = fourierShape(a10);
    const qs = Array.from({ length: 60 }, (_, i) => 1e-3 * 10 ** ((i * 6.7) / 59));
    const got = qs.map((q) => fourierShapeLookup(table, q));
    const want = qs.map((q) => fourierShapeAt(a10, q));
    expect(got).toAllClose(want, { atol: 1e-4 * table.peak });
  });

  it("F̃(0) equals the template area Y_cyl(5R500)/y0 computed by volume integrals", () => {
    const a10 = gnfwA10();
    expect(fourierShape(a10).peak).toAllClose(templateAreaOverY0(a10), { rtol: 1e-9 });
  });

  it("profileFourierAtEll scales as θ500² F̃(ell·θ500)", () => {
    const table = fourierShape(gnfwA10());
    const theta = 3e-3;
    const ells = new Float64Array([0, 100, 1000, 5000, 1e6]); // the last one is in the power-law tail (q = 3000)
    const out = profileFourierAtEll(table, theta, ells);
    expect(out).toAllClose(Array.from(ells, (l) => theta * theta * fourierShapeLookup(table, l * theta)), { rtol: 1e-14 });
  });
});
