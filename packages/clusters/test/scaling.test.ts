import { describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import {
  a10YmRelation,
  clusterScale,
  cosmologyPreset,
  createCosmology,
  gnfwA10,
  m500FromY,
  massFromTemperatureMsun,
  mpc2ToArcmin2,
  planck2014YmRelation,
  sphericalIntegral,
  temperatureFromMassKeV,
  theta500Arcmin,
  y500Arcmin2,
} from "../src/index.js";

const concordance = cosmologyPreset("concordance");

describe("Y–M relations", () => {
  it("Planck 2014 eq. 7 by hand: (1−b)M = 6e14, h = 0.7 gives D_A²Y500 = 1e-4·10^−0.186·E(z)^0.66 Mpc² (A&A 571, A20; from memory)", () => {
    const rel = planck2014YmRelation();
    const z = 0.3;
    expect(rel.y500Mpc2(6e14 / 0.8, z, concordance)).toAllClose(1e-4 * 10 ** -0.186 * concordance.efunc(z) ** 0.66, { rtol: 1e-12 });
    expect(rel.sigmaLnY).toAllClose(0.075 * Math.LN10, { rtol: 1e-12 });
  });

  it("the A10 profile-derived relation equals the A10 profile's own Y_sph(R500) to 1e-3 (eq. 25 against the integral)", () => {
    const rel = a10YmRelation();
    for (const [m, z] of [
      [2e14, 0.1],
      [9e14, 0.8],
    ] as const) {
      const s = clusterScale(m, z, concordance);
      const fromProfile = y500Arcmin2(gnfwA10({ m500Msun: m }), s);
      expect(mpc2ToArcmin2(rel.y500Mpc2(m, z, concordance), z, concordance)).toAllClose(fromProfile, { rtol: 1e-3 });
    }
  });

  it("with no mass bias the Planck relation lies within 10% of the A10 one (Planck 2014 calibrated it on A10-like X-ray masses)", () => {
    const a10 = a10YmRelation().y500Mpc2(6e14, 0.2, concordance);
    const pl = planck2014YmRelation({ oneMinusB: 1 }).y500Mpc2(6e14, 0.2, concordance);
    expect(pl / a10).toAllClose(1, { atol: 0.1 });
  });
});

describe("Y → M500 inversion", () => {
  const z = 0.5;
  const rel = planck2014YmRelation();
  const ratio5 = sphericalIntegral(gnfwA10(), 5, 5) / sphericalIntegral(gnfwA10(), 1, 5);
  const yOf = (m: number): number => mpc2ToArcmin2(rel.y500Mpc2(m, z, concordance), z, concordance) * ratio5;

  it("recovers the mass that generated Y5R500 to 1e-8, and θ500 with it", () => {
    const r = m500FromY({ yArcmin2: yOf(6e14), yErrArcmin2: 0.1 * yOf(6e14), z, cosmo: concordance, relation: rel });
    expect(r.m500Msun).toAllClose(6e14, { rtol: 1e-8 });
    expect(r.theta500Arcmin).toAllClose(theta500Arcmin(6e14, z, concordance), { rtol: 1e-8 });
    // fixed Y: σ_lnM = (σ_Y/Y)/α (α = 1.789)
    expect(r.sigmaLnM).toAllClose(0.1 / 1.789, { rtol: 1e-5 });
    expect(r.m500LowMsun).toAllClose(6e14 * 0.9 ** (1 / 1.789), { rtol: 1e-8 });
    expect(r.m500HighMsun).toAllClose(6e14 * 1.1 ** (1 / 1.789), { rtol: 1e-8 });
  });

  it("solves the coupled problem when the measured Y grows with the aperture (Y ∝ θ500^0.5)", () => {
    const mTrue = 4e14;
    const thetaTrue = theta500Arcmin(mTrue, z, concordance);
    const yMeas = (t: number): number => yOf(mTrue) * Math.sqrt(t / thetaTrue);
    const r = m500FromY({ yArcmin2: yMeas, yErrArcmin2: (t) => 0.2 * yMeas(t), z, cosmo: concordance, relation: rel });
    expect(r.m500Msun).toAllClose(mTrue, { rtol: 1e-8 });
    // θ500 ∝ M^{1/3} at fixed z, so d ln Y_meas/d ln M = 1/6 and σ_lnM = 0.2/(1.789 − 1/6)
    expect(r.sigmaLnM).toAllClose(0.2 / (1.789 - 1 / 6), { rtol: 1e-5 });
  });

  it("adds the intrinsic scatter in quadrature when asked", () => {
    const y = yOf(6e14);
    const r = m500FromY({ yArcmin2: y, yErrArcmin2: 0.1 * y, z, cosmo: concordance, relation: rel, includeScatter: true, definition: "y5r500" });
    expect(r.sigmaLnM).toAllClose(Math.hypot(0.1, 0.075 * Math.LN10) / 1.789, { rtol: 1e-5 });
  });

  it("rejects a non-positive Y with BAD_VALUE and reports NUMERIC when no mass in range fits", () => {
    const tryIt = (y: number): string => {
      try {
        m500FromY({ yArcmin2: y, yErrArcmin2: 1e-4, z, cosmo: concordance, relation: rel });
        return "ok";
      } catch (e) {
        return isUmbraError(e) ? e.code : "other";
      }
    };
    expect(tryIt(-1e-3)).toBe("BAD_VALUE");
    expect(tryIt(1e6)).toBe("NUMERIC");
  });
});

describe("T–M relation (Arnaud, Pointecouteau & Pratt 2005, A&A 441, 893)", () => {
  it("gives 5 keV at E(z)M500 = 10^14.58 h70^-1 M☉ (the relation's pivot, APP07 Table 2) and round-trips", () => {
    expect(temperatureFromMassKeV(10 ** 14.58, 0, concordance)).toAllClose(5, { rtol: 1e-12 });
    const t = temperatureFromMassKeV(6e14, 0.5, concordance);
    expect(massFromTemperatureMsun(t, 0.5, concordance)).toAllClose(6e14, { rtol: 1e-12 });
    // slope 1.71: doubling the mass raises T by 2^(1/1.71)
    expect(temperatureFromMassKeV(1.2e15, 0.5, concordance) / t).toAllClose(2 ** (1 / 1.71), { rtol: 1e-12 });
  });
  it("scales the pivot mass as h70^-1", () => {
    const c = createCosmology({ H0KmSMpc: 100, omegaM0: 0.3 });
    expect(temperatureFromMassKeV(10 ** 14.58 / (100 / 70), 0, c)).toAllClose(5, { rtol: 1e-12 });
  });
});
