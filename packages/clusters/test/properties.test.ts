import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { isUmbraError } from "@umbra/core";
import {
  betaModel,
  cosmologyPreset,
  createCosmology,
  cylindricalIntegral,
  gnfwA10,
  gnfwProfile,
  lineOfSightIntegral,
  m500ToR500Mpc,
  r500ToM500Msun,
  sphericalIntegral,
} from "../src/index.js";

const codeOf = (f: () => unknown): string => {
  try {
    f();
    return "ok";
  } catch (e) {
    return isUmbraError(e) ? e.code : "other";
  }
};

describe("identities that hold for any input (fast-check)", () => {
  const c = cosmologyPreset("cmb2018");

  it("M500 → R500 → M500 round-trips for any mass and redshift", () => {
    fc.assert(
      fc.property(fc.double({ min: 12, max: 16, noNaN: true }), fc.double({ min: 0, max: 5, noNaN: true }), (lgM, z) => {
        const m = 10 ** lgM;
        const r = m500ToR500Mpc(m, z, c);
        return Math.abs(r500ToM500Msun(r, z, c) / m - 1) < 1e-12;
      }),
      { numRuns: 50, seed: 20261201 },
    );
  });

  it("D_L = (1+z)² D_A and D_C grows with z in open, flat and closed universes", () => {
    const cosmos = [createCosmology({ H0KmSMpc: 70, omegaM0: 0.3, omegaDE0: 0.6 }), c, createCosmology({ H0KmSMpc: 70, omegaM0: 0.3, omegaDE0: 0.8 })];
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 }), fc.double({ min: 0.001, max: 8, noNaN: true }), fc.double({ min: 0.001, max: 1, noNaN: true }), (k, z, dz) => {
        const cc = cosmos[k]!;
        const da = cc.angularDiameterDistanceMpc(z);
        const ok1 = Math.abs(cc.luminosityDistanceMpc(z) / ((1 + z) ** 2 * da) - 1) < 1e-12;
        return ok1 && cc.comovingDistanceMpc(z + dz) > cc.comovingDistanceMpc(z);
      }),
      { numRuns: 40, seed: 20261202 },
    );
  });

  it("Y_cyl(X) never exceeds the whole truncated sphere and Y_sph(X) ≤ Y_cyl(X) (a sphere fits inside its cylinder)", () => {
    const p = gnfwA10();
    const total = sphericalIntegral(p, 5, 5);
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 5, noNaN: true }), (X) => {
        const cyl = cylindricalIntegral(p, X, 5);
        const sph = sphericalIntegral(p, X, 5);
        return sph <= cyl * (1 + 1e-12) && cyl <= total * (1 + 1e-12);
      }),
      { numRuns: 30, seed: 20261203 },
    );
  });

  it("the projection decreases outwards and vanishes at the truncation radius", () => {
    const p = betaModel({ coreRadiusR500: 0.3, beta: 0.8 });
    fc.assert(
      fc.property(fc.double({ min: 0, max: 4.9, noNaN: true }), fc.double({ min: 1e-3, max: 0.09, noNaN: true }), (x, dx) => lineOfSightIntegral(p, x + dx) < lineOfSightIntegral(p, x)),
      { numRuns: 40, seed: 20261202 },
    );
    expect(lineOfSightIntegral(p, 5)).toBe(0);
  });
});

describe("profile bad input", () => {
  it("rejects unphysical GNFW and β-model parameters with BAD_VALUE", () => {
    expect(codeOf(() => gnfwProfile({ P0: 8, c500: 1.2, gamma: 1.2, alpha: 1, beta: 5 }))).toBe("BAD_VALUE");
    expect(codeOf(() => gnfwProfile({ P0: 8, c500: 1.2, gamma: 0.3, alpha: 1, beta: 2.5 }))).toBe("BAD_VALUE");
    expect(codeOf(() => gnfwProfile({ P0: -1, c500: 1.2, gamma: 0.3, alpha: 1, beta: 5 }))).toBe("BAD_VALUE");
    expect(codeOf(() => betaModel({ coreRadiusR500: 0, beta: 2 / 3 }))).toBe("BAD_VALUE");
    expect(codeOf(() => gnfwA10({ m500Msun: -3e14 }))).toBe("BAD_VALUE");
    expect(codeOf(() => lineOfSightIntegral(gnfwA10(), -0.1))).toBe("BAD_VALUE");
    expect(codeOf(() => sphericalIntegral(gnfwA10(), 1, 0))).toBe("BAD_VALUE");
  });
});
