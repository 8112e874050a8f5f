import { describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import { bandIntegral, bandQuadrature, componentEffectiveFrequency, componentResponse, effectiveFrequency, validateBandpass } from "../src/index.js";
import type { Bandpass } from "../src/index.js";

const bp = (f: number[], w: number[], extra: Partial<Bandpass> = {}): Bandpass => ({
  frequencyGHz: Float64Array.from(f),
  weight: Float64Array.from(w),
  ...extra,
});

describe("bandpass integration", () => {
  it("integrates a power law over a top-hat to its closed form ∫ν^α dν = (b^(α+1) − a^(α+1))/(α+1) (calculus)", () => {
    for (const alpha of [-3.2, -0.7, 0, 1.6, 3.5]) {
      const [a, b] = [120, 180];
      const exact = (b ** (alpha + 1) - a ** (alpha + 1)) / (alpha + 1);
      expect(bandIntegral({ bandpass: bp([a, b], [1, 1]) }, (nu) => nu ** alpha)).toAllClose(exact, { rtol: 1e-13 });
      // the same top-hat sampled at 301 points and padded with zero-weight wings
      const f = [100, 119.999];
      const w = [0, 0];
      for (let i = 0; i <= 300; i++) {
        f.push(a + (60 * i) / 300);
        w.push(1);
      }
      f.push(180.001, 200);
      w.push(0, 0);
      const padded = bandIntegral({ bandpass: bp(f, w) }, (nu) => nu ** alpha);
      // the linear ramps of width 0.001 GHz at each edge add at most 0.001·ν^α
      expect(padded).toAllClose(exact, { rtol: 2e-5 });
    }
  });
  it("integrates a linear transmission times a power law exactly (trapezoid τ, Gauss–Legendre per interval)", () => {
    // τ = ν − 100 on [100, 200]; ∫ (ν − 100) ν² dν = [ν⁴/4 − 100ν³/3]
    const F = (v: number) => v ** 4 / 4 - (100 * v ** 3) / 3;
    expect(bandIntegral({ bandpass: bp([100, 200], [0, 100]) }, (nu) => nu * nu)).toAllClose(F(200) - F(100), { rtol: 1e-13 });
  });
  it("effective frequency of ν^α in a top-hat is ∫ν^(α+1)/∫ν^α (closed form)", () => {
    const alpha = -0.7;
    const [a, b] = [80, 110];
    const exact = ((b ** (alpha + 2) - a ** (alpha + 2)) / (alpha + 2)) / ((b ** (alpha + 1) - a ** (alpha + 1)) / (alpha + 1));
    expect(effectiveFrequency({ bandpass: bp([a, b], [1, 1]) }, (nu) => nu ** alpha)).toAllClose(exact, { rtol: 1e-13 });
    expect(componentEffectiveFrequency({ kind: "radio", alpha, refFrequencyGHz: 95 }, { bandpass: bp([a, b], [1, 1]) })).toAllClose(exact, { rtol: 1e-13 });
  });
  it("the default MJy/sr reference frequency is the transmission-weighted mean, overridable per band", () => {
    expect(bandQuadrature(bp([130, 170], [1, 1])).refFrequencyGHz).toAllClose(150, { rtol: 1e-14 });
    expect(bandQuadrature(bp([100, 200], [0, 1])).refFrequencyGHz).toAllClose(500 / 3, { rtol: 1e-14 });
    expect(bandQuadrature(bp([130, 170], [1, 1], { refFrequencyGHz: 143 })).refFrequencyGHz).toBe(143);
  });
  it("a radio source of index −1 reads exactly its amplitude in MJy/sr in any band (the ν⁻¹ reference)", () => {
    const band = { bandpass: bp([120, 150, 190], [0.2, 1, 0.5], { refFrequencyGHz: 150 }) };
    expect(componentResponse({ kind: "radio", alpha: -1, refFrequencyGHz: 150 }, band, "MJy/sr")).toAllClose(1, { rtol: 1e-13 });
  });
  it("rejects bad tables with a typed error naming the band and row", () => {
    const cases: [Bandpass, RegExp][] = [
      [bp([100], [1], { name: "f090" }), /band 'f090'.*at least two/],
      [bp([100, 90], [1, 1], { name: "f090" }), /row 2.*strictly increasing/],
      [bp([100, 110], [1, -1], { name: "f090" }), /row 2.*weight/],
      [bp([0, 110], [1, 1], { name: "f090" }), /row 1.*frequency/],
      [bp([100, 110], [0, 0], { name: "f090" }), /all zero/],
      [bp([100, 110, 120], [1, 1], { name: "f090" }), /3 frequencies but 2 weights/],
    ];
    for (const [b, re] of cases) {
      try {
        validateBandpass(b);
        expect.unreachable();
      } catch (e) {
        expect(isUmbraError(e, "BAD_VALUE")).toBe(true);
        expect((e as Error).message).toMatch(re);
      }
    }
  });
});

describe("bandpass invariances (properties)", () => {
  it("responses do not depend on the overall scale of the transmission (common practice)", async () => {
    const fc = (await import("fast-check")).default;
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1e6, noNaN: true }), fc.double({ min: 20, max: 800, noNaN: true }), (scale, nu) => {
        const f = [nu * 0.85, nu * 0.95, nu, nu * 1.1, nu * 1.2];
        const w = [0.1, 0.8, 1, 0.6, 0.05];
        const a = { bandpass: bp(f, w) };
        const b = { bandpass: bp(f, w.map((v) => v * scale)) };
        for (const c of [{ kind: "tsz" as const, kTeKeV: 7 }, { kind: "dust" as const, beta: 1.5, temperatureK: 18, refFrequencyGHz: 353 }]) {
          expect(componentResponse(c, b, "MJy/sr")).toAllClose(componentResponse(c, a, "MJy/sr"), { rtol: 1e-13 });
          expect(componentResponse(c, b, "K_CMB")).toAllClose(componentResponse(c, a, "K_CMB"), { rtol: 1e-13 });
        }
      }),
      { numRuns: 50, seed: 11 },
    );
  });
});
