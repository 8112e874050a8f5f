import { describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import {
  T0_K,
  componentResponse,
  dimensionlessFrequency,
  mixingColumn,
  mixingMatrix,
  planckIntensity,
  unitConversionFactor,
} from "../src/index.js";
import type { BandSpec, Bandpass, ComponentSpec } from "../src/index.js";

const band = (f: number[], w: number[]): Bandpass => ({ frequencyGHz: Float64Array.from(f), weight: Float64Array.from(w) });
const asym: BandSpec = { bandpass: band([125, 135, 150, 160, 172], [0.1, 0.9, 1, 0.7, 0]) };

describe("componentResponse", () => {
  it("CMB reads exactly 1 K_CMB per K_CMB in any band (the K_CMB calibration convention, docs/spectra.md)", () => {
    expect(componentResponse({ kind: "cmb" }, { frequencyGHz: 217 }, "K_CMB")).toAllClose(1, { rtol: 1e-15 });
    expect(componentResponse({ kind: "cmb" }, asym, "K_CMB")).toAllClose(1, { rtol: 1e-14 });
    expect(componentResponse({ kind: "cmb" }, asym, "uK_CMB")).toAllClose(1e6, { rtol: 1e-14 });
  });
  it("kSZ reads −T0 K_CMB per unit τv/c, v > 0 receding (Sunyaev & Zel'dovich 1980, MNRAS 190, 413)", () => {
    expect(componentResponse({ kind: "ksz" }, asym, "K_CMB")).toAllClose(-T0_K, { rtol: 1e-14 });
    expect(componentResponse({ kind: "ksz" }, { frequencyGHz: 90 }, "K_CMB")).toAllClose(-T0_K, { rtol: 1e-15 });
  });
  it("non-relativistic tSZ at 150 GHz is T0 (x coth(x/2) − 4) K_CMB per y (Birkinshaw 1999, Phys. Rep. 310, 97; equation numbers not checked)", () => {
    const x = dimensionlessFrequency(150);
    expect(componentResponse({ kind: "tsz" }, { frequencyGHz: 150 }, "K_CMB")).toAllClose(T0_K * (x / Math.tanh(x / 2) - 4), { rtol: 1e-14 });
  });
  it("a response in one unit times the unit conversion factor is the response in another", () => {
    const comps: ComponentSpec[] = [
      { kind: "tsz", kTeKeV: 8 },
      { kind: "dust", beta: 1.6, temperatureK: 20, refFrequencyGHz: 353 },
      { kind: "radio", alpha: -0.7, refFrequencyGHz: 30 },
    ];
    for (const c of comps) {
      const rK = componentResponse(c, asym, "K_CMB");
      const rM = componentResponse(c, asym, "MJy/sr");
      const rRJ = componentResponse(c, asym, "K_RJ");
      expect(rK * unitConversionFactor("K_CMB", "MJy/sr", asym)).toAllClose(rM, { rtol: 1e-13 });
      expect(rK * unitConversionFactor("K_CMB", "K_RJ", asym)).toAllClose(rRJ, { rtol: 1e-13 });
    }
  });
  it("dust and radio read 1 MJy/sr at their reference frequency and scale as ν^β B_ν(T_d) and ν^α (Hildebrand 1983)", () => {
    const dust: ComponentSpec = { kind: "dust", beta: 1.5, temperatureK: 19.6, refFrequencyGHz: 353 };
    expect(componentResponse(dust, { frequencyGHz: 353 }, "MJy/sr")).toAllClose(1, { rtol: 1e-15 });
    const ratio = (545 / 353) ** 1.5 * (planckIntensity(545, 19.6) / planckIntensity(353, 19.6));
    expect(componentResponse(dust, { frequencyGHz: 545 }, "MJy/sr")).toAllClose(ratio, { rtol: 1e-14 });
    const radio: ComponentSpec = { kind: "radio", alpha: -0.7, refFrequencyGHz: 150 };
    expect(componentResponse(radio, { frequencyGHz: 30 }, "MJy/sr")).toAllClose(5 ** 0.7, { rtol: 1e-14 });
  });
  it("a CIB component at redshift z equals dust at T_d/(1 + z) (redshifted modified blackbody)", () => {
    const cib: ComponentSpec = { kind: "cib", beta: 1.75, temperatureK: 30, redshift: 2, refFrequencyGHz: 545 };
    const dust: ComponentSpec = { kind: "dust", beta: 1.75, temperatureK: 10, refFrequencyGHz: 545 };
    expect(componentResponse(cib, asym, "K_CMB")).toAllClose(componentResponse(dust, asym, "K_CMB"), { rtol: 1e-14 });
  });
  it("bad parameters give typed errors naming the field", () => {
    const cases: [ComponentSpec, string][] = [
      [{ kind: "tsz", kTeKeV: -1 }, "kTeKeV"],
      [{ kind: "dust", beta: 1.5, temperatureK: -3, refFrequencyGHz: 353 }, "temperatureK"],
      [{ kind: "radio", alpha: Number.NaN, refFrequencyGHz: 30 }, "alpha"],
      [{ kind: "cib", beta: 1.5, temperatureK: 20, redshift: -1, refFrequencyGHz: 353 }, "redshift"],
      [{ kind: "sync" } as unknown as ComponentSpec, "kind"],
    ];
    for (const [c, field] of cases) {
      try {
        componentResponse(c, { frequencyGHz: 100 }, "K_CMB");
        expect.unreachable();
      } catch (e) {
        expect(isUmbraError(e)).toBe(true);
        expect((e as { place: { field?: string } }).place.field).toBe(field);
      }
    }
  });
});

describe("mixingMatrix", () => {
  it("is bands × components row-major with each entry equal to componentResponse", () => {
    const bands: BandSpec[] = [{ frequencyGHz: 90 }, { frequencyGHz: 150 }, asym, { frequencyGHz: 353 }];
    const comps: ComponentSpec[] = [{ kind: "tsz", kTeKeV: 5 }, { kind: "cmb" }, { kind: "dust", beta: 1.6, temperatureK: 20, refFrequencyGHz: 353 }];
    const m = mixingMatrix(bands, comps, "uK_CMB");
    expect(m.nBands).toBe(4);
    expect(m.nComponents).toBe(3);
    for (let b = 0; b < 4; b++) {
      for (let c = 0; c < 3; c++) {
        expect(m.values[b * 3 + c]).toAllClose(componentResponse(comps[c]!, bands[b]!, "uK_CMB"), { rtol: 1e-15 });
      }
    }
    expect(mixingColumn(m, 1)).toAllClose([1e6, 1e6, 1e6, 1e6], { rtol: 1e-13 });
  });
});
