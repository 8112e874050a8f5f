import { describe, expect, it } from "vitest";
import {
  betaModel,
  centralY,
  clusterScale,
  cosmologyPreset,
  cylindricalIntegral,
  gnfwA10,
  lineOfSightIntegral,
  p500KeVCm3,
  projectedShape,
  sphericalIntegral,
  y5r500Arcmin2,
  y5r500OverY0Arcmin2,
  ySphMpc2,
  yCylMpc2,
  a10AlphaPPrime,
  gnfwProfile,
  gnfwParameterSet,
  theta500Arcmin,
  theta500ToM500Msun,
  y5r500Mpc2,
} from "../src/index.js";
import { integrate } from "../src/numerics/quadrature.js";
import { REFERENCE } from "./reference.js";

const xs = new Float64Array([0, 0.01, 0.1, 0.3, 1, 2.5, 4]);

describe("β-model projection against closed forms", () => {
  // untruncated: ℓ(x) = x_c √π Γ(3β/2 − 1/2)/Γ(3β/2) (1 + x²/x_c²)^(1/2 − 3β/2)
  // (Cavaliere & Fusco-Femiano 1976, A&A 49, 137; standard result, e.g. Sarazin 1988, X-ray emission from clusters of galaxies, eq. 5.68)
  const xc = 0.2;
  const cases: [number, number][] = [
    [2 / 3, Math.PI], // Γ(1/2)/Γ(1) = √π
    [1, 2 / Math.sqrt(Math.PI)], // Γ(1)/Γ(3/2)
    [4 / 3, Math.sqrt(Math.PI) / 2], // Γ(3/2)/Γ(2)
  ];
  for (const [beta, gammaRatioTimesSqrtPi] of cases) {
    it(`β = ${beta.toFixed(3)}: untruncated line-of-sight integral matches to 1e-9`, () => {
      const prof = betaModel({ coreRadiusR500: xc, beta });
      const got = projectedShape(prof, xs, Infinity);
      const want = Array.from(xs, (x) => xc * (beta === 2 / 3 ? Math.PI : gammaRatioTimesSqrtPi * Math.sqrt(Math.PI)) * (1 + (x * x) / (xc * xc)) ** (0.5 - 1.5 * beta));
      // for β = 2/3 the prefactor is √π·Γ(1/2)/Γ(1) = π; for the others √π·(Γ ratio)
      expect(got).toAllClose(want, { rtol: 1e-9 });
    });
  }

  it("β = 2/3 truncated at 5 R500: ℓ(x) = 2x_c²/a · atan(√(T²−x²)/a), a² = x_c² + x² (elementary integral)", () => {
    const prof = betaModel({ coreRadiusR500: xc, beta: 2 / 3 });
    const want = Array.from(xs, (x) => {
      const a = Math.hypot(xc, x);
      return ((2 * xc * xc) / a) * Math.atan(Math.sqrt(25 - x * x) / a);
    });
    expect(projectedShape(prof, xs, 5)).toAllClose(want, { rtol: 1e-9 });
  });

  it("β = 2/3 spherical integral: 4π x_c² (X − x_c atan(X/x_c)) (elementary integral)", () => {
    const prof = betaModel({ coreRadiusR500: xc, beta: 2 / 3 });
    for (const X of [0.1, 1, 3]) expect(sphericalIntegral(prof, X, 5)).toAllClose(4 * Math.PI * xc * xc * (X - xc * Math.atan(X / xc)), { rtol: 1e-10 });
  });

  it("β = 1 cylinder through an infinite model: 2π x_c³ ln(1 + X²/x_c²) (integral of the closed-form projection)", () => {
    // ℓ(x) = 2x_c/(1 + x²/x_c²) ⇒ 2π∫0^X x ℓ dx = 2π x_c³ ln(1 + X²/x_c²); compare with a truncation far out (T = 1e4)
    const prof = betaModel({ coreRadiusR500: xc, beta: 1 });
    const X = 1;
    const T = 1e4;
    // the line of sight cut at √(T² − x²) misses ≈ π X² x_c³/T² in total: 1e-9 relative for T = 1e4
    expect(cylindricalIntegral(prof, X, T)).toAllClose(2 * Math.PI * xc ** 3 * Math.log(1 + (X * X) / (xc * xc)), { rtol: 1e-7 });
  });
});

describe("A10 universal profile", () => {
  const a10 = gnfwA10();
  const g = REFERENCE.gnfw_integrals;

  it("reproduces Arnaud et al. 2010's I(1) = 0.6145 and I(5) = 1.1037 (their eq. 25; from memory of the paper) to 1e-3", () => {
    const I = (x: number): number => (3 * sphericalIntegral(a10, x, 5)) / (4 * Math.PI);
    expect(I(1)).toAllClose(0.6145, { rtol: 1e-3 });
    expect(I(5)).toAllClose(1.1037, { rtol: 1e-3 });
    // and the same integrals by scipy quad (fixtures/clusters/make_reference.py) to 1e-8
    expect(I(1)).toAllClose(g.I1, { rtol: 1e-8 });
    expect(I(5)).toAllClose(g.I5, { rtol: 1e-8 });
    // Y_sph(5R500)/Y_sph(R500) ≈ 1.796 (≈ 1.79 as usually quoted)
    expect(I(5) / I(1)).toAllClose(1.1037 / 0.6145, { rtol: 2e-3 });
  });

  it("gives Y_cyl(R500)/Y_sph(R500) ≈ 1.203 (Arnaud et al. 2010, Sect. 6.1; from memory) and the scipy value to 1e-7", () => {
    const ratio = cylindricalIntegral(a10, 1, 5) / sphericalIntegral(a10, 1, 5);
    expect(ratio).toAllClose(1.203, { rtol: 1e-3 });
    expect(ratio).toAllClose(g.ycyl_r500_over_ysph_r500, { rtol: 1e-7 });
  });

  it("Y_cyl by the shell decomposition equals 2π∫ x ℓ(x) dx computed from the projection itself", () => {
    const direct = 2 * Math.PI * integrate((x) => x * lineOfSightIntegral(a10, x, 5), 0, 1, { rtol: 1e-9 });
    expect(cylindricalIntegral(a10, 1, 5)).toAllClose(direct, { rtol: 1e-7 });
  });

  it("central line-of-sight integral agrees with scipy quad to 1e-8", () => {
    expect(lineOfSightIntegral(a10, 0, 5)).toAllClose(g.central_line_integral_T5, { rtol: 1e-8 });
  });

  it("the projection converges: halving the quadrature tolerance changes nothing at 1e-5", () => {
    // independent brute-force check: composite Simpson in t with 20000 steps on the sinh-substituted integrand
    const x = 0.3;
    const tMax = Math.acosh(5 / x);
    const n = 20000;
    const h = tMax / n;
    let s = 0;
    for (let i = 0; i <= n; i++) {
      const t = i * h;
      const w = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
      s += w * a10.pressureRatio(x * Math.cosh(t)) * x * Math.cosh(t);
    }
    expect(lineOfSightIntegral(a10, x, 5)).toAllClose((2 * s * h) / 3, { rtol: 1e-5 });
  });

  it("reproduces the A10 worked normalisation: Y_sph(R500) = 2.925e-5 I(1) E(z)^{2/3} (M/3e14)^{5/3+α_P} h70^-1 Mpc² (eq. 25; from memory)", () => {
    const c = cosmologyPreset("concordance");
    for (const [m, z] of [
      [3e14, 0.05],
      [8e14, 0.4],
    ] as const) {
      const prof = gnfwA10({ m500Msun: m });
      const s = clusterScale(m, z, c);
      const I1 = (3 * sphericalIntegral(a10, 1, 5)) / (4 * Math.PI);
      const want = 2.925e-5 * I1 * c.efunc(z) ** (2 / 3) * (m / 3e14) ** (5 / 3 + 0.12);
      expect(ySphMpc2(prof, s, 1)).toAllClose(want, { rtol: 1e-3 });
    }
  });

  it("P500 follows A10 eq. 5 and α'_P vanishes near R500 (α_P + α'_P(1) ≈ 0 only approximately; eq. 10)", () => {
    const c = cosmologyPreset("concordance");
    expect(p500KeVCm3(3e14, 0, c)).toAllClose(1.65e-3, { rtol: 1e-12 });
    expect(a10AlphaPPrime(0)).toAllClose(0.1, { rtol: 1e-12 });
    expect(a10AlphaPPrime(1e3)).toAllClose(-0.12, { rtol: 1e-6 });
  });

  it("Y5R500 (disc of 5θ500 through the 5R500 sphere) equals Y_sph(5R500), and y0 ties to Y5R500/y0", () => {
    const c = cosmologyPreset("concordance");
    const prof = gnfwA10({ m500Msun: 6e14 });
    const s = clusterScale(6e14, 0.5, c);
    expect(yCylMpc2(prof, s, 5, 5)).toAllClose(ySphMpc2(prof, s, 5, 5), { rtol: 1e-10 });
    const y0 = centralY(prof, s);
    expect(y5r500Arcmin2(prof, s) / y0).toAllClose(y5r500OverY0Arcmin2(prof, s.theta500Arcmin), { rtol: 1e-9 });
  });
});

describe("more closed forms and conventions", () => {
  it("β = 4/3 cylinder: x_c·√πΓ(3/2)/Γ(2)·2πx_c²/(3−3β)·[(1+X²/x_c²)^{(3−3β)/2} − 1] (integral of the general-β projection)", () => {
    const xc = 0.25;
    const beta = 4 / 3;
    const pref = xc * (Math.PI / 2); // √π Γ(3/2)/Γ(2) = π/2
    const X = 0.8;
    const want = ((pref * 2 * Math.PI * xc * xc) / (3 - 3 * beta)) * ((1 + (X * X) / (xc * xc)) ** ((3 - 3 * beta) / 2) - 1);
    // truncation at 1e3 R500: the missing line-of-sight tail is ~x_c⁴/T³, far below 1e-9
    expect(cylindricalIntegral(betaModel({ coreRadiusR500: xc, beta }), X, 1e3)).toAllClose(want, { rtol: 1e-8 });
  });

  it("θ500 → M500 inverts M500 → θ500, and Y5R500 in Mpc² is D_A² times Y5R500 in arcmin²", () => {
    const c = cosmologyPreset("cmb2018");
    const t = theta500Arcmin(7e14, 0.3, c);
    expect(theta500ToM500Msun(t, 0.3, c)).toAllClose(7e14, { rtol: 1e-12 });
    const s = clusterScale(7e14, 0.3, c);
    const prof = gnfwA10({ m500Msun: 7e14, h70: c.h70 });
    expect(y5r500Mpc2(prof, s)).toAllClose((y5r500Arcmin2(prof, s) * (s.dAMpc * Math.PI / 10800) ** 2), { rtol: 1e-12 });
  });

  it("the A10 sub-sample parameter sets integrate to within 10% of the universal I(1) (consistency, no source)", () => {
    const I1 = (name: string): number => (3 * sphericalIntegral(gnfwProfile(gnfwParameterSet(name)), 1, 5)) / (4 * Math.PI);
    const u = I1("a10");
    expect(I1("a10-cool-core") / u).toAllClose(1, { atol: 0.1 });
    expect(I1("a10-disturbed") / u).toAllClose(1, { atol: 0.1 });
  });
});
