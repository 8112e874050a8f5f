import { describe, expect, it } from "vitest";
import { T0_K, componentResponse, dimensionlessFrequency, frequencyFromDimensionless, tszIntensity, tszShape, dPlanckdT } from "../src/index.js";
import { REFERENCE } from "./reference.js";

/** Bisection root of f on [a, b] (f(a), f(b) of opposite sign). */
function root(f: (x: number) => number, a: number, b: number): number {
  let fa = f(a);
  for (let i = 0; i < 200 && b - a > 1e-14 * b; i++) {
    const m = 0.5 * (a + b);
    const fm = f(m);
    if (fm === 0) return m;
    if (fm * fa < 0) b = m;
    else {
      a = m;
      fa = fm;
    }
  }
  return 0.5 * (a + b);
}

/** Golden-section search for the minimum of f on [a, b]. */
function argmin(f: (x: number) => number, a: number, b: number): number {
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  for (let i = 0; i < 200 && b - a > 1e-9; i++) {
    if (f(c) < f(d)) b = d;
    else a = c;
    c = b - g * (b - a);
    d = a + g * (b - a);
  }
  return 0.5 * (a + b);
}

describe("non-relativistic tSZ", () => {
  it("has its null at x ≈ 3.830, ≈ 217.5 GHz for T0 = 2.7255 K (fact of the trade; scipy brentq in reference.json)", () => {
    const x0 = root(tszShape, 2, 6);
    expect(x0).toAllClose(REFERENCE.tsz_nonrel.x_null, { rtol: 1e-12 });
    expect(x0).toAllClose(3.830, { atol: 5e-4 });
    expect(frequencyFromDimensionless(x0)).toAllClose(217.5, { atol: 0.1 });
  });
  it("has its deepest intensity decrement near 128.7 GHz and its peak near 369.8 GHz (fact of the trade: 120–130 and 360–370 GHz)", () => {
    const fMin = argmin(tszIntensity, 50, 200);
    const fMax = argmin((f) => -tszIntensity(f), 250, 500);
    expect(fMin).toAllClose(REFERENCE.tsz_nonrel.x_intensity_min * REFERENCE.tsz_nonrel.ghz_per_x, { rtol: 1e-7 });
    expect(fMax).toAllClose(REFERENCE.tsz_nonrel.x_intensity_max * REFERENCE.tsz_nonrel.ghz_per_x, { rtol: 1e-7 });
    expect(fMin > 120 && fMin < 130).toBe(true);
    expect(fMax > 360 && fMax < 370).toBe(true);
  });
  it("tends to ΔT = −2 y T0 at low frequency (Rayleigh–Jeans limit, fact of the trade)", () => {
    expect(componentResponse({ kind: "tsz" }, { frequencyGHz: 0.01 }, "K_CMB")).toAllClose(-2 * T0_K, { rtol: 1e-8 });
    expect(componentResponse({ kind: "tsz" }, { frequencyGHz: 1 }, "K_RJ")).toAllClose(-2 * T0_K, { rtol: 1e-3 });
    expect(tszShape(1e-6)).toAllClose(-2, { atol: 1e-12 });
  });
  it("intensity form equals T0 dB/dT (x coth(x/2) − 4) (Birkinshaw 1999, Phys. Rep. 310, 97; equation numbers not checked)", () => {
    for (const f of [30, 98, 150, 220, 280, 400, 857]) {
      const x = dimensionlessFrequency(f);
      expect(tszIntensity(f)).toAllClose(T0_K * dPlanckdT(f) * (x / Math.tanh(x / 2) - 4), { rtol: 1e-13 });
    }
  });
});
