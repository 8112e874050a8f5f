import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { isUmbraError } from "@umbra/core";
import { cosineEllWindows, mergeAtBoundary, parseEllWindows, windowCount, windowValue } from "../src/ilc/index.js";

const sumAt = (set: ReturnType<typeof cosineEllWindows>, ell: number): number => {
  let s = 0;
  for (let j = 0; j < windowCount(set); j++) s += windowValue(set, j, ell);
  return s;
};

describe("cosine-edged ell windows", () => {
  it("sum linearly to one at every multipole (property; cos² + sin² = 1)", () => {
    const set = cosineEllWindows([200, 500, 1200, 3000], 0.5);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 20000, noNaN: true }), (ell) => {
        expect(sumAt(set, ell)).toAllClose(1, { rtol: 1e-14 });
      }),
      { numRuns: 500, seed: 1 },
    );
  });

  it("are one inside their range, zero outside, and cross at 1/2 on each boundary", () => {
    const set = cosineEllWindows([1000, 3000], 0.4); // transition at 1000 spans 800–1200
    expect([windowValue(set, 0, 500), windowValue(set, 1, 500), windowValue(set, 2, 500)]).toAllClose([1, 0, 0], { atol: 0 });
    expect([windowValue(set, 0, 1000), windowValue(set, 1, 1000)]).toAllClose([0.5, 0.5], { rtol: 1e-14 });
    expect([windowValue(set, 0, 1200), windowValue(set, 1, 2000), windowValue(set, 2, 1e5)]).toAllClose([0, 1, 1], { atol: 1e-15 });
  });

  it("keep transitions from overlapping when boundaries are close", () => {
    const set = cosineEllWindows([100, 120, 5000], 1.0);
    expect(set.transitionsEll).toAllClose([20, 20, 4880], { rtol: 1e-15 });
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e4, noNaN: true }), (ell) => {
        for (let j = 0; j < 4; j++) expect(windowValue(set, j, ell) >= 0).toBe(true);
        expect(sumAt(set, ell)).toAllClose(1, { rtol: 1e-14 });
      }),
      { numRuns: 300, seed: 2 },
    );
  });

  it("still sum to one after merging two neighbours", () => {
    const set = mergeAtBoundary(cosineEllWindows([200, 500, 1200], 0.5), 1);
    expect(windowCount(set)).toBe(3);
    for (const ell of [0, 150, 200, 400, 500, 700, 1200, 5000]) expect(sumAt(set, ell)).toAllClose(1, { rtol: 1e-14 });
  });

  it("parse comma-separated boundaries and reject bad ones with BAD_OPTION", () => {
    expect(parseEllWindows("300, 800,2000").boundariesEll).toEqual([300, 800, 2000]);
    expect(windowCount(parseEllWindows(""))).toBe(1);
    for (const bad of ["300,200", "abc", "-5", "0"]) {
      try {
        parseEllWindows(bad);
        expect.unreachable();
      } catch (e) {
        expect(isUmbraError(e, "BAD_OPTION")).toBe(true);
      }
    }
  });
});
