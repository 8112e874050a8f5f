/**
 * Apodisation windows and the distance transform, against scipy (reference values made by
 * fixtures/fourier/make_window_reference.py: scipy.signal.windows.tukey and
 * scipy.ndimage.distance_transform_edt; versions recorded in the JSON).
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { UmbraError } from "@umbra/core";
import { apodisationWindow, apodiseMask, distanceToRemoved, taper1d, windowMoment, windowPowerFraction } from "../src/fourier/index.js";

const ref = JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/fourier/window_reference.json", import.meta.url)), "utf8")) as {
  library: string;
  tukey: { n: number; widthPix: number; window: number[] }[];
  edt: { nx: number; ny: number; mask: number[]; distance: number[]; distanceEdgeRemoved: number[] }[];
};

describe(`tukey taper against ${ref.library}`, () => {
  for (const c of ref.tukey) {
    it(`n = ${c.n}, width ${c.widthPix} px equals scipy.signal.windows.tukey(n, 2·width/(n−1))`, () => {
      expect(taper1d(c.n, c.widthPix, "tukey")).toAllClose(c.window, { rtol: 0, atol: 1e-15 });
    });
  }
});

describe("cosine taper and 2-D windows", () => {
  it("cosine taper is sin²(π·d/(2W)) at the pixel-centre distance d from the edge, 1 inside, symmetric", () => {
    const w = taper1d(10, 3, "cosine");
    const f = (d: number): number => Math.sin((Math.PI * d) / 6) ** 2;
    expect(w).toAllClose([f(0.5), f(1.5), f(2.5), 1, 1, 1, 1, f(2.5), f(1.5), f(0.5)], { rtol: 1e-15 });
  });

  it("apodisationWindow is the outer product of the x and y tapers, within [0, 1]", () => {
    const nx = 12;
    const ny = 7;
    const w = apodisationWindow(nx, ny, 2.5, "cosine");
    const wx = taper1d(nx, 2.5, "cosine");
    const wy = taper1d(ny, 2.5, "cosine");
    for (let y = 0; y < ny; y++) {
      for (let x = 0; x < nx; x++) expect(w[y * nx + x]).toAllClose((wx[x] as number) * (wy[y] as number), { rtol: 1e-15 });
    }
    expect(Math.min(...w)).toBeGreaterThan(0);
    expect(Math.max(...w)).toBeLessThanOrEqual(1);
  });

  it("width 0 gives ones; a negative width or an unknown kind is a typed error", () => {
    expect(apodisationWindow(4, 3, 0, "tukey")).toAllClose([1], { rtol: 0, atol: 0 });
    expect(() => apodisationWindow(4, 3, -1)).toThrow(UmbraError);
    expect(() => taper1d(4, 1, "hamming" as "cosine")).toThrow(/unknown window kind/);
    expect(() => apodisationWindow(0, 3, 1)).toThrow(UmbraError);
    expect(() => apodiseMask(new Float64Array(6), 2.5, 2.4, 1)).toThrow(UmbraError);
  });

  it("windowPowerFraction is mean(w²) and windowMoment(w, 4) is mean(w⁴)", () => {
    const w = Float64Array.from([0, 0.5, 1, 1]);
    expect(windowPowerFraction(w)).toAllClose((0 + 0.25 + 1 + 1) / 4, { rtol: 1e-15 });
    expect(windowMoment(w, 4)).toAllClose((0.0625 + 2) / 4, { rtol: 1e-15 });
  });
});

describe(`exact Euclidean distance transform against ${ref.library}`, () => {
  for (const c of ref.edt) {
    it(`${c.nx}×${c.ny} mask equals scipy.ndimage.distance_transform_edt, with and without a removed border ring`, () => {
      expect(distanceToRemoved(c.mask, c.nx, c.ny, false)).toAllClose(c.distance, { rtol: 1e-14, atol: 0 });
      expect(distanceToRemoved(c.mask, c.nx, c.ny, true)).toAllClose(c.distanceEdgeRemoved, { rtol: 1e-14, atol: 0 });
    });
  }

  it("a mask with nothing removed is infinitely far from removed pixels unless the border counts", () => {
    const ones = new Float64Array(6).fill(1);
    expect(distanceToRemoved(ones, 3, 2, false)).toAllClose([Infinity], { rtol: 0 });
    expect(distanceToRemoved(ones, 3, 2, true)).toAllClose([1, 1, 1, 1, 1, 1], { rtol: 0 });
  });
});

describe("apodiseMask", () => {
  it("is 0 on removed pixels, ½(1 − cos(π d/W)) near them and 1 far away", () => {
    const nx = 21;
    const ny = 21;
    const mask = new Float64Array(nx * ny).fill(1);
    mask[10 * nx + 10] = 0;
    mask[3] = Number.NaN; // NaN counts as removed
    const w = apodiseMask(mask, nx, ny, 5, false);
    expect(w[10 * nx + 10]).toBe(0);
    expect(w[3]).toBe(0);
    expect(w[10 * nx + 13]).toAllClose(0.5 * (1 - Math.cos((Math.PI * 3) / 5)), { rtol: 1e-15 });
    expect(w[13 * nx + 14]).toAllClose(1, { rtol: 0 }); // distance 5 = W
    expect(w[20 * nx + 20]).toBe(1);
    const wEdge = apodiseMask(mask, nx, ny, 5);
    expect(wEdge[20 * nx + 20]).toAllClose(0.5 * (1 - Math.cos(Math.PI / 5)), { rtol: 1e-15 });
  });

  it("rejects a mask of the wrong size", () => {
    expect(() => apodiseMask(new Float64Array(5), 2, 3, 1)).toThrow(UmbraError);
  });
});
