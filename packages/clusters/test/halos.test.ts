/**
 * Halo mass function (Tinker et al. 2008) and its linear power spectrum (Eisenstein & Hu 1998
 * no-wiggle transfer function). Reference values: fixtures/halos/halo_reference.json, made by
 * fixtures/halos/make_halo_reference.py (astropy 5.2.1 / scipy 1.10.1, an independent Python
 * implementation: ODE growth factor, quad integrals, finite-difference slopes).
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { createRng, isUmbraError } from "@umbra/core";
import {
  comovingVolumeElementMpc3,
  drawHalos,
  eh98NoWiggleTransfer,
  eh98Scales,
  growthFactor,
  haloCountGrid,
  linearPower,
  sigmaM,
  sigmaR,
  tinker08DnDlnM,
  tinker08F,
  tinker08Params,
  tinker08Splines,
  naturalSpline,
  type HaloCosmology,
} from "../src/halos/index.js";

interface Ref {
  cosmology: { h: number; omegaM0: number; omegaB0: number; sigma8: number; ns: number; tcmbK: number };
  eh98: Record<string, number> & { k: number[]; transfer: number[] };
  astropy: { criticalDensity0MsunPerMpc3: number; z: number[]; comovingDistanceMpc: number[]; volumeElementMpc3PerSr: number[] };
  growth: { z: number[]; D: number[] };
  sigma: { mMsun: number[]; sigma0: number[] };
  tinker: { sigma: number[]; deltaMean: number[]; f: number[][]; paramsAt: { deltaMean: number; z: number; p: number[] }[] };
  dndlnm: { mMsun: number[]; z: number[]; values: number[][] };
  counts: { areaDeg2: number; mMinMsun: number; mMaxMsun: number; zMin: number; zMax: number; expected: number };
}
const ref = JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/halos/halo_reference.json", import.meta.url)), "utf8")) as Ref;

/** A flat ΛCDM background without radiation, written here so the test does not depend on the cosmology module. */
function testCosmology(): HaloCosmology {
  const c = ref.cosmology;
  const efunc = (z: number): number => Math.sqrt(c.omegaM0 * (1 + z) ** 3 + 1 - c.omegaM0);
  // ρ_crit = 3 H0² / (8πG); G (CODATA 2018), Mpc (IAU 2012 au × 648000/π), M☉ as astropy (IAU 2015 GM☉ / G)
  const G = 6.6743e-11;
  const mpc = 3.0856775814913673e22;
  const msun = 1.988409870698051e30;
  const h0 = (100 * c.h * 1000) / mpc;
  const rhoc0 = ((3 * h0 * h0) / (8 * Math.PI * G)) * (mpc ** 3 / msun);
  return {
    ...c,
    efunc,
    comovingDistanceMpc(z: number): number {
      const n = 200;
      let s = 0;
      for (let i = 0; i <= n; i++) s += (i === 0 || i === n ? 1 : i % 2 ? 4 : 2) / efunc((z * i) / n);
      return ((299792.458 / (100 * c.h)) * s * z) / (3 * n);
    },
    criticalDensityMsunPerMpc3: (z: number) => rhoc0 * efunc(z) ** 2,
  };
}
const cosmo = testCosmology();

describe("Eisenstein & Hu 1998 scales and no-wiggle transfer function", () => {
  it("reproduces the EH98 eqs. 2–7 and 26 numbers of the Python reference", () => {
    const s = eh98Scales(cosmo);
    // EH98, ApJ 496, 605, eqs. 2, 3, 4, 6, 7, 26 (coded again in the reference script)
    expect([s.zEq, s.kEqPerMpc, s.zDrag, s.soundHorizonMpc, s.soundHorizonFitMpc, s.kSilkPerMpc]).toAllClose(
      [ref.eh98.zEq!, ref.eh98.kEqPerMpc!, ref.eh98.zDrag!, ref.eh98.soundHorizonMpc!, ref.eh98.soundHorizonFitMpc!, ref.eh98.kSilkPerMpc!],
      { rtol: 1e-12 },
    );
  });
  it("has the eq. 26 sound-horizon fit within 2 % of the eq. 6 closed form, as EH98 §4.2 state", () => {
    const s = eh98Scales(cosmo);
    expect(s.soundHorizonFitMpc).toAllClose(s.soundHorizonMpc, { rtol: 0.02 });
  });
  it("gives a drag-epoch sound horizon within 3 % of the Planck 2018 r_drag = 147.09 Mpc for a Planck-like cosmology", () => {
    // Planck Collaboration 2020, A&A 641, A6, Table 2 (TT,TE,EE+lowE+lensing): r_drag = 147.09 ± 0.26 Mpc,
    // Ω_b h² = 0.02237, Ω_c h² = 0.1200, h = 0.6736; EH98 eq. 6 is known to run ~2 % high (from memory)
    const h = 0.6736;
    const planck: HaloCosmology = { ...cosmo, h, omegaB0: 0.02237 / h ** 2, omegaM0: (0.02237 + 0.12 + 0.00064) / h ** 2 };
    expect(eh98Scales(planck).soundHorizonMpc).toAllClose(147.09, { rtol: 0.03 });
  });
  it("matches the reference T(k) from large scales (T → 1) to the damping tail", () => {
    expect(eh98NoWiggleTransfer(cosmo, ref.eh98.k)).toAllClose(ref.eh98.transfer, { rtol: 1e-12 });
  });
});

describe("growth factor and σ(M)", () => {
  it("agrees with an ODE solution of the linear growth equation to 1e-5", () => {
    // Heath 1977 integral vs scipy solve_ivp of D'' + (3/a + dlnE/da) D' = 1.5 Ω_m D /(a⁵E²)
    expect(ref.growth.z.map((z) => growthFactor(cosmo, z))).toAllClose(ref.growth.D, { rtol: 1e-5 });
  });
  it("is normalised so that σ(8 h⁻¹ Mpc) = σ8", () => {
    const p = linearPower(cosmo);
    expect(sigmaR(p, 8 / cosmo.h)).toAllClose(cosmo.sigma8!, { rtol: 1e-12 });
  });
  it("gives σ(M) at z = 0 within 1e-5 of scipy quad integrals", () => {
    const p = linearPower(cosmo);
    expect(ref.sigma.mMsun.map((m) => sigmaM(p, m, 0).sigma)).toAllClose(ref.sigma.sigma0, { rtol: 1e-5 });
  });
  it("rejects a cosmology without σ8 with a BAD_VALUE error naming the field", () => {
    const { sigma8: _drop, ...rest } = cosmo;
    void _drop;
    let err: unknown = null;
    try {
      linearPower(rest as HaloCosmology);
    } catch (e) {
      err = e;
    }
    expect(isUmbraError(err, "BAD_VALUE")).toBe(true);
    expect((err as Error).message).toContain("sigma8");
  });
});

describe("Tinker et al. 2008 mass function", () => {
  it("returns the Table 2 numbers exactly at the tabulated overdensities", () => {
    // Tinker et al. 2008, ApJ 688, 709, Table 2, Δ = 200 and 1600 at z = 0
    const p200 = tinker08Params(200, 0);
    const p1600 = tinker08Params(1600, 0);
    expect([p200.A, p200.a, p200.b, p200.c]).toAllClose([0.186, 1.47, 2.57, 1.19], { rtol: 1e-12 });
    expect([p1600.A, p1600.a, p1600.b, p1600.c]).toAllClose([0.26, 2.3, 1.46, 1.97], { rtol: 1e-12 });
  });
  it("interpolates smoothly: the spline's value between knots stays within the neighbouring table values' range ± 0.05", () => {
    // Table 2 between Δ = 400 and 600 (A 0.212–0.218, a 1.56–1.61, b 2.05–1.87, c 1.34–1.45)
    const p = tinker08Params(500, 0);
    expect(p.A).toBeGreaterThan(0.212 - 0.05);
    expect(p.A).toBeLessThan(0.218 + 0.05);
    expect(p.b).toBeGreaterThan(1.87 - 0.05);
    expect(p.b).toBeLessThan(2.05 + 0.05);
  });
  it("passes the spline's second derivatives through unchanged (the Table 2 rows)", () => {
    const s = tinker08Splines();
    expect(s.c.y2).toAllClose([0, 0.94, -0.43, 4.61, 0.01, 1.21, 1.43, 0.33, 0], { rtol: 0 });
  });
  it("evaluates f(σ) as eq. 3 with the interpolated parameters, matching the Python reference", () => {
    const got = ref.tinker.deltaMean.map((dm) => ref.tinker.sigma.map((s) => tinker08F(s, tinker08Params(dm, 0))));
    expect(got.flat()).toAllClose(ref.tinker.f.flat(), { rtol: 1e-10 });
  });
  it("applies the redshift evolution of eqs. 5–8", () => {
    for (const { deltaMean, z, p } of ref.tinker.paramsAt) {
      const q = tinker08Params(deltaMean, z);
      expect([q.A, q.a, q.b, q.c]).toAllClose(p, { rtol: 1e-10 });
    }
  });
  it("gives dn/dlnM (500c) within 1e-4 of the independent Python integration at 1e14–1e15 M☉ and z = 0–1", () => {
    const p = linearPower(cosmo);
    const got = ref.dndlnm.z.map((z) => ref.dndlnm.mMsun.map((m) => tinker08DnDlnM(p, m, z)));
    expect(got.flat()).toAllClose(ref.dndlnm.values.flat(), { rtol: 1e-4 });
  });
  it("rejects an overdensity outside Table 2's range with BAD_VALUE", () => {
    expect(() => tinker08Params(100, 0)).toThrow(/200 <= Delta_mean <= 3200/);
  });
});

describe("natural cubic spline", () => {
  it("matches scipy's CubicSpline(bc_type='natural') second derivatives on Table 2's A column", () => {
    // scipy 1.17.1 CubicSpline(log10 Δ, A, bc_type="natural")(x, 2) printed to 3 decimals (one-off run)
    const s = naturalSpline(
      [200, 300, 400, 600, 800, 1200, 1600, 2400, 3200].map((d) => Math.log10(d)),
      [0.186, 0.2, 0.212, 0.218, 0.248, 0.255, 0.26, 0.26, 0.26],
    );
    expect(s.y2).toAllClose([0, 0.506, -1.642, 3.144, -2.942, 1.001, -0.663, 0.194, 0], { atol: 6e-4 });
  });
});

describe("halo counts and Poisson draws", () => {
  const areaSr = ref.counts.areaDeg2 * (Math.PI / 180) ** 2;
  const range = { mMinMsun: ref.counts.mMinMsun, mMaxMsun: ref.counts.mMaxMsun, zMin: ref.counts.zMin, zMax: ref.counts.zMax, areaSr };
  it("has the comoving volume element of astropy's differential_comoving_volume", () => {
    expect(ref.astropy.z.map((z) => comovingVolumeElementMpc3(cosmo, z))).toAllClose(ref.astropy.volumeElementMpc3PerSr, { rtol: 1e-6 });
  });
  it("integrates the mass function to the scipy double integral within 0.5 %", () => {
    const grid = haloCountGrid(linearPower(cosmo), { ...range, nMass: 48, nZ: 40 });
    // midpoint rule on a 48 × 40 grid against scipy dblquad (rtol 1e-6)
    expect(grid.expectedTotal).toAllClose(ref.counts.expected, { rtol: 5e-3 });
  });
  it("draws a Poisson number of halos consistent with the integral (mean and variance over 400 draws)", () => {
    const grid = haloCountGrid(linearPower(cosmo), { ...range, nMass: 24, nZ: 20 });
    const rng = createRng(20260101);
    const counts: number[] = [];
    let inRange = true;
    for (let i = 0; i < 400; i++) {
      const h = drawHalos(grid, rng.fork(i));
      counts.push(h.length);
      for (const x of h) if (x.m500Msun < range.mMinMsun || x.m500Msun > range.mMaxMsun || x.z < range.zMin || x.z > range.zMax) inRange = false;
    }
    const mean = counts.reduce((a, b) => a + b, 0) / counts.length;
    const variance = counts.reduce((a, b) => a + (b - mean) ** 2, 0) / (counts.length - 1);
    const lambda = grid.expectedTotal;
    // Poisson: the sample mean has standard error sqrt(λ/400); 4σ bound (common practice, no source)
    expect(Math.abs(mean - lambda)).toBeLessThan(4 * Math.sqrt(lambda / 400));
    // variance of a Poisson sample variance ≈ (λ + 2λ²)/n (from memory); 4σ
    expect(Math.abs(variance - lambda)).toBeLessThan(4 * Math.sqrt((lambda + 2 * lambda * lambda) / 400));
    expect(inRange).toBe(true);
  });
  it("puts the drawn masses in the mass bins in proportion to the mass function (chi-square, 6 bins)", () => {
    const grid = haloCountGrid(linearPower(cosmo), { ...range, nMass: 24, nZ: 20 });
    const rng = createRng(7);
    const all = [] as number[];
    for (let i = 0; i < 200; i++) for (const h of drawHalos(grid, rng.fork(i))) all.push(Math.log(h.m500Msun));
    const nb = 6;
    const obs = new Float64Array(nb);
    const exp = new Float64Array(nb);
    const edges = grid.lnMEdges;
    const per = (edges.length - 1) / nb;
    for (const x of all) obs[Math.min(nb - 1, Math.floor((x - edges[0]!) / ((edges[edges.length - 1]! - edges[0]!) / nb)))]! += 1;
    for (let iz = 0; iz < grid.zEdges.length - 1; iz++)
      for (let im = 0; im < edges.length - 1; im++) exp[Math.floor(im / per)]! += grid.counts[iz * (edges.length - 1) + im]!;
    const scale = all.length / exp.reduce((a, b) => a + b, 0);
    let chi2 = 0;
    for (let b = 0; b < nb; b++) chi2 += (obs[b]! - exp[b]! * scale) ** 2 / (exp[b]! * scale);
    // 5 degrees of freedom: P(χ² > 20.5) = 0.001 (chi-square table)
    expect(chi2).toBeLessThan(20.5);
  });
});
