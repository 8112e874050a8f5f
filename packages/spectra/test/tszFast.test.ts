import { describe, expect, it } from "vitest";
import { createRng } from "@umbra/core";
import {
  createFastRelativisticTsz,
  dimensionlessFrequency,
  frequencyFromDimensionless,
  tszRelativisticShapeExact,
  tszShape,
} from "../src/index.js";

const fast = createFastRelativisticTsz();

describe("fast relativistic tSZ evaluator", () => {
  it("agrees with the exact integral to 1e-5 relative where |ΔT/T0| > 0.05 and 3e-6 absolute elsewhere, 10 GHz–1 THz, 0–60 keV", () => {
    const rng = createRng(20261201);
    const xLo = dimensionlessFrequency(10);
    const xHi = dimensionlessFrequency(1000);
    for (let trial = 0; trial < 24; trial++) {
      const kte = 60 * rng.uniform();
      const xs = Float64Array.from({ length: 24 }, () => xLo + (xHi - xLo) * rng.uniform());
      const ex = tszRelativisticShapeExact(xs, kte);
      const fa = xs.map((x) => fast.shape(x, kte));
      for (let i = 0; i < xs.length; i++) {
        if (Math.abs(ex[i]!) > 0.05) expect(fa[i]!).toAllClose(ex[i]!, { rtol: 1e-5 });
        else expect(fa[i]!).toAllClose(ex[i]!, { atol: 3e-6 });
      }
    }
  });
  it("is exactly the Kompaneets shape at kTe = 0", () => {
    for (const x of [0.01, 0.3, 3.83, 9.7, 20]) expect(fast.shape(x, 0)).toAllClose(tszShape(x), { rtol: 1e-15, atol: 1e-15 });
  });
  it("falls back to the exact integral beyond the table (x > xMax or kTe > kTeMaxKeV)", () => {
    const x = fast.xMax + 1;
    expect(fast.shape(x, 20)).toAllClose(tszRelativisticShapeExact(Float64Array.of(x), 20)[0]!, { rtol: 1e-14 });
    expect(fast.shape(5, 80)).toAllClose(tszRelativisticShapeExact(Float64Array.of(5), 80)[0]!, { rtol: 1e-14 });
  });
  it("evaluates arrays of (frequency, kTe) pairs or one kTe for all frequencies", () => {
    const f = Float64Array.from([30, 90, 150, 220, 280, 350]);
    const t = Float64Array.from([0, 3, 6, 9, 12, 15]);
    const out = fast.responseMany(f, t);
    for (let i = 0; i < f.length; i++) expect(out[i]!).toAllClose(fast.response(f[i]!, t[i]!), { rtol: 1e-15 });
    const one = fast.responseMany(f, 7);
    for (let i = 0; i < f.length; i++) expect(one[i]!).toAllClose(fast.shape(dimensionlessFrequency(f[i]!), 7), { rtol: 1e-15 });
  });
  it("rejects a negative electron temperature with a typed error", () => {
    expect(() => fast.response(150, -2)).toThrow(/electron temperature -2 keV/);
    expect(frequencyFromDimensionless(fast.xMax)).toBeGreaterThan(1000);
  });
});

describe("band-integrated tSZ response as a function of kTe", () => {
  it("equals componentResponse for delta and tabulated bands in K_CMB and MJy/sr (same table, summed differently)", async () => {
    const { createTszBandResponse, componentResponse } = await import("../src/index.js");
    const bp = { frequencyGHz: Float64Array.from([130, 140, 150, 160, 170]), weight: Float64Array.from([0, 1, 1, 0.8, 0]) };
    for (const band of [{ frequencyGHz: 93 }, { frequencyGHz: 277 }, { bandpass: bp }]) {
      for (const unit of ["K_CMB", "MJy/sr"] as const) {
        const ev = createTszBandResponse(band, unit);
        for (const kte of [0, 0.5, 7, 23.3, 59, 70]) {
          expect(ev.response(kte)).toAllClose(componentResponse({ kind: "tsz", kTeKeV: kte }, band, unit), { rtol: 1e-12, atol: 1e-14 });
        }
      }
    }
  });
});
