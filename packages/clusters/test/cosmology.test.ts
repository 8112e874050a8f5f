import { describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import { createCosmology, cosmologyPreset, m500ToR500Mpc, r500ToM500Msun, theta500Arcmin, type CosmologyParams } from "../src/index.js";
import { integrate } from "../src/numerics/quadrature.js";
import { REFERENCE } from "./reference.js";

const at = (f: (z: number) => number, zs: number[]): number[] => zs.map(f);

// Reference: astropy.cosmology 5.2.1 (Debian python3-astropy), fixtures/clusters/make_reference.py
describe("cosmology against astropy.cosmology", () => {
  for (const ref of REFERENCE.cosmologies) {
    it(`${ref.name}: densities, E(z), distances, lookback time and ρ_c agree to 1e-6 relative`, () => {
      const c = createCosmology(ref.params as unknown as CosmologyParams);
      expect(c.omegaGamma0).toAllClose(ref.Ogamma0, { rtol: 1e-9 });
      expect(c.omegaNu0).toAllClose(ref.Onu0, { rtol: 1e-9 });
      expect(c.omegaDE0).toAllClose(ref.Ode0, { rtol: 1e-9 });
      expect(c.omegaK0).toAllClose(ref.Ok0, { rtol: 1e-9, atol: 1e-14 });
      const o = { rtol: 1e-6 };
      expect(at(c.efunc, ref.z)).toAllClose(ref.efunc, o);
      expect(at(c.comovingDistanceMpc, ref.z)).toAllClose(ref.comoving_mpc, o);
      expect(at(c.transverseComovingDistanceMpc, ref.z)).toAllClose(ref.transverse_comoving_mpc, o);
      expect(at(c.angularDiameterDistanceMpc, ref.z)).toAllClose(ref.angular_diameter_mpc, o);
      expect(at(c.luminosityDistanceMpc, ref.z)).toAllClose(ref.luminosity_mpc, o);
      expect(at(c.lookbackTimeGyr, ref.z)).toAllClose(ref.lookback_gyr, o);
      expect(at(c.criticalDensityMsunPerMpc3, ref.z)).toAllClose(ref.critical_density_msun_mpc3, o);
      expect(at(c.omegaMz, ref.z)).toAllClose(ref.omega_m_z, o);
      expect(at(c.differentialComovingVolumeMpc3PerSr, ref.z)).toAllClose(ref.diff_comoving_volume_mpc3_sr, o);
      expect(ref.pairs.map(([a, b]) => c.angularDiameterDistanceBetweenMpc(a, b))).toAllClose(ref.angular_diameter_between_mpc, o);
    });
  }

  it("the cmb2018 preset is the cmb2018 parameter set of the reference and close to astropy's own Planck18", () => {
    const c = cosmologyPreset("cmb2018");
    const ref = REFERENCE.cosmologies.find((r) => r.name === "cmb2018")!;
    expect(at(c.angularDiameterDistanceMpc, ref.z)).toAllClose(ref.angular_diameter_mpc, { rtol: 1e-6 });
    // astropy's Planck18 uses Om0 = 0.30966 against our (Ω_b h² + Ω_c h²)/h² = 0.309645: 5e-5 apart
    expect(at(c.angularDiameterDistanceMpc, REFERENCE.planck18.z)).toAllClose(REFERENCE.planck18.angular_diameter_mpc, { rtol: 3e-5 });
    expect(c.massiveNuEV).toEqual([0.06]);
    expect(c.sigma8).toAllClose(0.8102, { rtol: 0 });
  });
});

describe("cosmology facts", () => {
  it("D_A of flat Ω_m = 0.3 peaks near z = 1.6 (a fact of the trade, e.g. Hogg 1999, astro-ph/9905116, Fig. 2)", () => {
    const c = cosmologyPreset("concordance");
    // golden-section search for the maximum of D_A(z)
    let a = 0.5;
    let b = 4;
    const g = (Math.sqrt(5) - 1) / 2;
    for (let i = 0; i < 60; i++) {
      const x1 = b - g * (b - a);
      const x2 = a + g * (b - a);
      if (c.angularDiameterDistanceMpc(x1) > c.angularDiameterDistanceMpc(x2)) b = x2;
      else a = x1;
    }
    const zPeak = (a + b) / 2;
    expect(zPeak).toAllClose(1.6, { atol: 0.05 });
  });

  it("an Einstein–de Sitter universe has D_C = 2 D_H (1 − 1/√(1+z)) (closed form, Hogg 1999, eq. 15 integrated)", () => {
    const c = createCosmology({ H0KmSMpc: 70, omegaM0: 1 });
    for (const z of [0.2, 1, 3]) expect(c.comovingDistanceMpc(z)).toAllClose(2 * c.hubbleDistanceMpc * (1 - 1 / Math.sqrt(1 + z)), { rtol: 1e-10 });
    // age of an EdS universe: 2/(3 H0) (closed form)
    expect(c.lookbackTimeGyr(1e8)).toAllClose((2 / 3) * c.hubbleTimeGyr, { rtol: 1e-6 });
  });

  it("ρ_c0 = 2.775e11 h² M☉/Mpc³ (common practice value, e.g. Peacock 1999, Cosmological Physics, eq. 3.61)", () => {
    const c = createCosmology({ H0KmSMpc: 100, omegaM0: 0.3 });
    expect(c.criticalDensityMsunPerMpc3(0)).toAllClose(2.775e11, { rtol: 1e-3 });
  });

  it("M500 ↔ R500 round-trips and θ500 = R500/D_A", () => {
    const c = cosmologyPreset("concordance");
    const r = m500ToR500Mpc(6e14, 0.5, c);
    expect(r500ToM500Msun(r, 0.5, c)).toAllClose(6e14, { rtol: 1e-12 });
    expect(theta500Arcmin(6e14, 0.5, c)).toAllClose(((r / c.angularDiameterDistanceMpc(0.5)) * 180 * 60) / Math.PI, { rtol: 1e-12 });
    // M = (4π/3)·500·ρc·R³ by hand
    expect((4 / 3) * Math.PI * 500 * c.criticalDensityMsunPerMpc3(0.5) * r ** 3).toAllClose(6e14, { rtol: 1e-12 });
  });

  it("lookback time equals the integral of dt = dz/((1+z)H) evaluated independently", () => {
    const c = cosmologyPreset("cmb2018");
    const t = integrate((z) => 1 / ((1 + z) * c.efunc(z)), 0, 2) * c.hubbleTimeGyr;
    expect(c.lookbackTimeGyr(2)).toAllClose(t, { rtol: 1e-9 });
  });
});

describe("cosmology bad input", () => {
  const code = (f: () => unknown): string | undefined => {
    try {
      f();
    } catch (e) {
      return isUmbraError(e) ? `${e.code}:${e.message}` : "other";
    }
    return undefined;
  };
  it("rejects Ω_m < 0, H0 ≤ 0 and negative neutrino masses with BAD_VALUE naming the value", () => {
    expect(code(() => createCosmology({ H0KmSMpc: 70, omegaM0: -0.1 }))).toMatch(/^BAD_VALUE:.*omegaM0 = -0.1/);
    expect(code(() => createCosmology({ H0KmSMpc: 0, omegaM0: 0.3 }))).toMatch(/^BAD_VALUE:.*H0KmSMpc = 0/);
    expect(code(() => createCosmology({ H0KmSMpc: 70, omegaM0: 0.3, tcmb0K: 2.7, massiveNuEV: [-1] }))).toMatch(/BAD_VALUE:.*massiveNuEV\[0\] = -1/);
  });
  it("rejects a universe without a big bang (E(z)² ≤ 0 on the way back)", () => {
    // Ω_m = 0.1, Ω_Λ = 2: E² = 0.1(1+z)³ − 1.1(1+z)² + 2 is negative near z = 0.45
    expect(code(() => createCosmology({ H0KmSMpc: 70, omegaM0: 0.1, omegaDE0: 2 }))).toMatch(/^BAD_VALUE:.*omegaDE0 = 2: no big bang/);
  });
  it("rejects negative redshifts and unknown preset names", () => {
    const c = cosmologyPreset("concordance");
    expect(code(() => c.angularDiameterDistanceMpc(-0.1))).toMatch(/^BAD_VALUE:.*z = -0.1/);
    expect(code(() => cosmologyPreset("lcdm-best"))).toMatch(/^BAD_VALUE:.*unknown cosmology preset 'lcdm-best'/);
    expect(code(() => m500ToR500Mpc(0, 0.3, c))).toMatch(/^BAD_VALUE:.*m500Msun = 0/);
    expect(code(() => m500ToR500Mpc(-1e14, 0.3, c))).toMatch(/^BAD_VALUE:.*m500Msun = -100000000000000/);
  });
});
