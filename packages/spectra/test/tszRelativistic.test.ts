import { describe, expect, it } from "vitest";
import {
  itohCoefficients,
  thetaFromKeV,
  tszCrossoverItoh,
  tszRelativisticShapeExact,
  tszShape,
  blackbodyDerivativeShape,
  gaussLegendre,
} from "../src/index.js";
import { REFERENCE } from "./reference.js";

const XS = Float64Array.from([0.18, 0.5, 1, 1.76, 2.6, 3.2, 4.6, 6, 8, 10, 13, 17.6]); // ≈ 10 GHz … 1 THz

describe("exact relativistic tSZ (Wright 1979 single scattering)", () => {
  it("is converged: doubling every quadrature order changes it by < 1e-8 relative over 10 GHz–1 THz, 0.1–60 keV", () => {
    for (const kte of [0.1, 10, 60]) {
      const a = tszRelativisticShapeExact(XS, kte);
      const b = tszRelativisticShapeExact(XS, kte, undefined, { angleNodes: 80, speedNodes: 64, uMax: 80 });
      expect(a).toAllClose(b, { rtol: 1e-8 });
    }
  });
  it("tends to the Kompaneets shape x coth(x/2) − 4 as kTe → 0 (Sunyaev & Zel'dovich 1972), exactly at kTe = 0", () => {
    const nr = XS.map((x) => tszShape(x));
    expect(tszRelativisticShapeExact(XS, 0)).toAllClose(nr, { rtol: 0 });
    // at 1 eV the first-order series Y0 + θY1 (Itoh et al. 1998, eqs. 2.25–2.27) is exact to ~θ² ≈ 4e-12
    const th = thetaFromKeV(0.001);
    const first = XS.map((x) => itohCoefficients(x)[0] + th * itohCoefficients(x)[1]);
    expect(tszRelativisticShapeExact(XS, 0.001)).toAllClose(first, { rtol: 1e-6 });
  });
  it("agrees with the Itoh, Kohyama & Nozawa 1998 (ApJ 502, 7, eqs. 2.25–2.30) expansion to within its last term at kTe ≤ 10 keV, x ≤ 10", () => {
    // For an asymptotic series the truncation error is bounded by the size of the last retained
    // term (here θ⁴Y4) while the terms still decrease; we require |exact − series| ≤ max(|θ⁴Y4|, 1e-9).
    const xs = Float64Array.from([0.3, 0.7, 1.2, 2, 2.8, 5, 6, 7, 8, 9, 10]);
    for (const kte of [0.5, 1, 2, 5, 10]) {
      const th = thetaFromKeV(kte);
      const ex = tszRelativisticShapeExact(xs, kte);
      for (let i = 0; i < xs.length; i++) {
        const c = itohCoefficients(xs[i]!);
        const series = c[0] + th * (c[1] + th * (c[2] + th * (c[3] + th * c[4])));
        const last = Math.abs(th ** 4 * c[4]);
        expect(ex[i]!).toAllClose(series, { atol: Math.max(last, 1e-9) });
      }
    }
  });
  it("agrees with the Itoh et al. 1998 expansion to 1e-5 relative at kTe ≤ 2 keV for x ≤ 8 and to 2e-4 at 5 keV for x ≤ 6", () => {
    const check = (kte: number, xs: number[], rtol: number) => {
      const th = thetaFromKeV(kte);
      const ex = tszRelativisticShapeExact(Float64Array.from(xs), kte);
      xs.forEach((x, i) => {
        const c = itohCoefficients(x);
        expect(ex[i]!).toAllClose(c[0] + th * (c[1] + th * (c[2] + th * (c[3] + th * c[4]))), { rtol });
      });
    };
    check(2, [0.3, 1, 2, 3, 5, 6, 8], 1e-5);
    check(5, [0.3, 1, 2, 3, 5, 6], 2e-4);
  });
  it("reproduces the Rayleigh–Jeans series −2y(1 − 17θ/10 + 123θ²/40 − …) (Itoh et al. 1998, eq. 2.25 at X → 0)", () => {
    const th = thetaFromKeV(2);
    const x = Float64Array.of(0.01);
    expect(tszRelativisticShapeExact(x, 2)[0]).toAllClose(-2 * (1 - 1.7 * th + 3.075 * th * th), { rtol: 1e-5 });
  });
  it("moves the crossover as x0 = 3.830(1 + 1.1674θ − 0.8533θ²) (Itoh, Kohyama & Nozawa 1998, ApJ 502, 7, their crossover fit) to 1e-3 in x at 2–30 keV", () => {
    for (const kte of [2, 5, 10, 20, 30]) {
      let a = 3.6;
      let b = 5.2;
      const f = (x: number) => tszRelativisticShapeExact(Float64Array.of(x), kte)[0]!;
      let fa = f(a);
      for (let i = 0; i < 40; i++) {
        const m = 0.5 * (a + b);
        const fm = f(m);
        if (fm * fa < 0) b = m;
        else {
          a = m;
          fa = fm;
        }
      }
      expect(0.5 * (a + b)).toAllClose(tszCrossoverItoh(kte), { atol: 1e-3 });
    }
  });
  it("raises the photon energy by 4θ K3(1/θ)/K2(1/θ) per scattering: (4/3)<γ²β²> (Rybicki & Lightman 1979, eq. 7.16a) over a Maxwell–Jüttner gas (K from scipy kve)", () => {
    // ∫ΔI dν / ∫B dν = τ (<e^s> − 1) = y · 4 K3/K2, i.e. ∫ G(x) Y(x, θ) dx = (4π⁴/15) K3/K2
    const edges = [0, 2, 4, 6, 8, 10, 12, 15, 20, 30, 45, 70, 100, 150, 220, 300, 400];
    const rule = gaussLegendre(16);
    const xs: number[] = [];
    const ws: number[] = [];
    for (let k = 0; k + 1 < edges.length; k++) {
      const a = edges[k]!;
      const b = edges[k + 1]!;
      for (let i = 0; i < 16; i++) {
        xs.push(0.5 * (a + b) + 0.5 * (b - a) * rule.nodes[i]!);
        ws.push(0.5 * (b - a) * rule.weights[i]!);
      }
    }
    for (const ref of REFERENCE.maxwell_juttner.filter((r) => r.kte_kev === 5 || r.kte_kev === 50)) {
      const y = tszRelativisticShapeExact(Float64Array.from(xs), ref.kte_kev);
      let s = 0;
      for (let i = 0; i < xs.length; i++) s += ws[i]! * blackbodyDerivativeShape(xs[i]!) * y[i]!;
      expect(s / ((4 * Math.PI ** 4) / 15)).toAllClose(ref.k3_over_k2, { rtol: 1e-7 });
    }
  });
});
