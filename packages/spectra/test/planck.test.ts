import { describe, expect, it } from "vitest";
import {
  BOLTZMANN_K_JPK,
  ELECTRON_REST_ENERGY_KEV,
  PLANCK_H_JS,
  SPEED_OF_LIGHT_MPS,
  THOMSON_CROSS_SECTION_M2,
  cmbIntensityScale,
  dPlanckdT,
  dimensionlessFrequency,
  frequencyFromDimensionless,
  planckIntensity,
  rayleighJeansPerK,
} from "../src/index.js";
import { REFERENCE } from "./reference.js";

describe("constants", () => {
  it("match astropy's CODATA 2018 constants (astropy 5.2.1, fixtures/spectra/reference.json)", () => {
    const c = REFERENCE.constants;
    expect(REFERENCE.astropy).toBe("5.2.1");
    expect(PLANCK_H_JS).toAllClose(c.h_Js, { rtol: 1e-15 });
    expect(BOLTZMANN_K_JPK).toAllClose(c.k_B_JpK, { rtol: 1e-15 });
    expect(SPEED_OF_LIGHT_MPS).toAllClose(c.c_mps, { rtol: 1e-15 });
    expect(THOMSON_CROSS_SECTION_M2).toAllClose(c.sigma_T_m2, { rtol: 1e-15 });
    // astropy forms m_e c² from m_e and c; CODATA 2018 quotes 0.51099895000 MeV directly
    expect(ELECTRON_REST_ENERGY_KEV).toAllClose(c.m_e_c2_keV, { rtol: 1e-10 });
  });
});

describe("Planck function", () => {
  it("B_nu(T) matches astropy's BlackBody model to 1e-12 over 1 GHz–3 THz and 2.7–100 K", () => {
    for (const r of REFERENCE.planck) {
      expect(planckIntensity(r.frequency_ghz, r.temperature_k)).toAllClose(r.b_mjy_sr, { rtol: 1e-12 });
    }
  });
  it("dB/dT matches a finite difference of astropy's BlackBody to 1e-9 (the difference's own error)", () => {
    for (const r of REFERENCE.planck) {
      expect(dPlanckdT(r.frequency_ghz, r.temperature_k)).toAllClose(r.dbdt_mjy_sr_per_k, { rtol: 1e-9 });
    }
  });
  it("x = h nu / k T0 is 1.76085 at 100 GHz and inverts exactly (h/k_B T0 with CODATA 2018, T0 = 2.7255 K)", () => {
    expect(dimensionlessFrequency(100)).toAllClose(100 / REFERENCE.tsz_nonrel.ghz_per_x, { rtol: 1e-13 });
    expect(frequencyFromDimensionless(dimensionlessFrequency(217.3))).toAllClose(217.3, { rtol: 1e-14 });
  });
  it("B_nu(T0) = I0 x^3/(e^x − 1) with I0 = 2(kT0)^3/(hc)^2 (Rybicki & Lightman 1979, eq. 1.51; astropy BlackBody)", () => {
    for (const r of REFERENCE.planck.filter((p) => p.temperature_k === 2.7255)) {
      const x = dimensionlessFrequency(r.frequency_ghz);
      expect((cmbIntensityScale() * x ** 3) / Math.expm1(x)).toAllClose(r.b_mjy_sr, { rtol: 1e-12 });
    }
    for (const f of [30, 150, 600]) {
      const x = dimensionlessFrequency(f);
      expect(planckIntensity(f, 2.7255)).toAllClose((cmbIntensityScale() * x ** 3) / Math.expm1(x), { rtol: 1e-13 });
    }
  });
  it("tends to the Rayleigh–Jeans law 2kT nu^2/c^2 at low frequency (Rybicki & Lightman 1979, eq. 1.53)", () => {
    expect(planckIntensity(0.01, 20)).toAllClose(20 * rayleighJeansPerK(0.01), { rtol: 2e-5 });
    expect(dPlanckdT(0.001, 2.7255)).toAllClose(rayleighJeansPerK(0.001), { rtol: 1e-5 });
  });
  it("returns zero intensity for zero temperature and finite values deep in the Wien tail (x ≈ 1800)", () => {
    expect(planckIntensity(150, 0)).toBe(0);
    expect(Number.isFinite(dPlanckdT(5000))).toBe(true);
    expect(dPlanckdT(100000)).toBe(0);
    expect(planckIntensity(100000, 2.7255)).toBe(0);
  });
});
