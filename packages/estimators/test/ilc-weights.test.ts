import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { isUmbraError } from "@umbra/core";
import { checkCovariance, combinedVariance, constrainedIlcWeights, standardIlcWeights } from "../src/ilc/index.js";
import { effectiveModeCount, ilcBiasFraction, apodisationModeFactor } from "../src/ilc/index.js";

const f64 = (xs: number[]): Float64Array => Float64Array.from(xs);
const dot = (a: Float64Array, b: Float64Array): number => a.reduce((s, v, i) => s + v * (b[i] as number), 0);

describe("standard ILC weights", () => {
  it("match the hand-solved 2-band case w = C⁻¹a/(aᵀC⁻¹a)", () => {
    // Closed form (common practice; Eriksen et al. 2004, ApJ 612, 633, eq. 5), solved by hand:
    // C = [[4, 3], [3, 9]], det C = 27, C⁻¹ = [[9, −3], [−3, 4]]/27, a = (1, 2)
    // C⁻¹a = (9 − 6, −3 + 8)/27 = (3, 5)/27, aᵀC⁻¹a = (3 + 10)/27 = 13/27
    // w = (3/13, 5/13), minimum variance wᵀCw = 1/(aᵀC⁻¹a) = 27/13.
    const cov = f64([4, 3, 3, 9]);
    const w = standardIlcWeights(cov, f64([1, 2]));
    expect(w).toAllClose([3 / 13, 5 / 13], { rtol: 1e-12 });
    expect(combinedVariance(cov, w)).toAllClose(27 / 13, { rtol: 1e-12 });
  });

  it("do not depend on the overall scale of the covariance or of each band's unit", () => {
    // algebra: C → D C D, a → D a gives w → D⁻¹ w (common practice, no source)
    const cov = f64([4, 3, 3, 9]);
    const s = 1e-12;
    const scaled = f64([4 * s * 1e6, 3 * s * 1e3, 3 * s * 1e3, 9 * s]); // band 0 in units 1e3 times smaller
    const w = standardIlcWeights(cov, f64([1, 2]));
    const w2 = standardIlcWeights(scaled, f64([1e3, 2]));
    expect(w2).toAllClose([(w[0] as number) / 1e3, w[1] as number], { rtol: 1e-10 });
  });

  it("give unit response to the target for random positive-definite covariances (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 16, maxLength: 16 }), fc.array(fc.double({ min: 0.2, max: 3, noNaN: true }), { minLength: 4, maxLength: 4 }), (g, a) => {
        // C = G Gᵀ + 0.1 I is positive definite
        const m = 4;
        const cov = new Float64Array(m * m);
        for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) {
          let s = i === j ? 0.1 : 0;
          for (let l = 0; l < m; l++) s += (g[i * m + l] as number) * (g[j * m + l] as number);
          cov[i * m + j] = s;
        }
        const w = standardIlcWeights(cov, f64(a));
        expect(dot(w, f64(a))).toAllClose(1, { rtol: 1e-9 });
      }),
      { numRuns: 50, seed: 5 },
    );
  });
});

describe("constrained ILC weights", () => {
  it("are fixed by the constraints alone in a 2-band, 2-constraint case", () => {
    // wᵀa = 1, wᵀb = 0 with a = (1, 2), b = (1, 1): w1 + 2 w2 = 1, w1 + w2 = 0 ⇒ w = (−1, 1),
    // whatever C (Remazeilles, Delabrouille & Cardoso 2011, MNRAS 410, 2481, eq. 18 reduces to A⁻ᵀe).
    const w = constrainedIlcWeights(f64([4, 3, 3, 9]), [f64([1, 2]), f64([1, 1])]);
    expect(w).toAllClose([-1, 1], { rtol: 1e-12 });
  });

  it("give exact unit and zero responses and the minimum variance among such weights (3-band brute force)", () => {
    // 3 bands, 2 constraints: admissible weights are w0 + t n with n ⟂ a, b (n = a × b).
    const cov = f64([2.0, 0.6, 0.3, 0.6, 1.5, 0.9, 0.3, 0.9, 3.0]);
    const a = f64([-0.9, -0.4, 1.7]); // tSZ-like: negative, negative, positive
    const b = f64([1, 1, 1]); // CMB in K_CMB
    const w = constrainedIlcWeights(cov, [a, b]);
    expect(dot(w, a)).toAllClose(1, { rtol: 1e-12 });
    expect(dot(w, b)).toAllClose(0, { atol: 1e-12 });
    const n = f64([
      (a[1] as number) * (b[2] as number) - (a[2] as number) * (b[1] as number),
      (a[2] as number) * (b[0] as number) - (a[0] as number) * (b[2] as number),
      (a[0] as number) * (b[1] as number) - (a[1] as number) * (b[0] as number),
    ]);
    const vOpt = combinedVariance(cov, w);
    let best = Infinity;
    let bestT = NaN;
    for (let i = -20000; i <= 20000; i++) {
      const t = i * 1e-4;
      const trial = w.map((v, j) => v + t * (n[j] as number));
      const v = combinedVariance(cov, trial);
      if (v < best) {
        best = v;
        bestT = t;
      }
    }
    expect(bestT).toAllClose(0, { atol: 1e-4 });
    expect(vOpt).toAllClose(best, { rtol: 1e-8 });
    expect(vOpt <= best * (1 + 1e-12)).toBe(true);
  });

  it("reduce to the standard ILC with one constraint, and cost more variance with each added constraint", () => {
    const cov = f64([2.0, 0.6, 0.3, 0.6, 1.5, 0.9, 0.3, 0.9, 3.0]);
    const a = f64([-0.9, -0.4, 1.7]);
    const w1 = constrainedIlcWeights(cov, [a]);
    expect(w1).toAllClose(standardIlcWeights(cov, a), { rtol: 1e-12 });
    const w2 = constrainedIlcWeights(cov, [a, f64([1, 1, 1])]);
    expect(combinedVariance(cov, w2) > combinedVariance(cov, w1)).toBe(true);
  });

  it("reject a covariance that is not positive definite with BAD_DATA naming the domain", () => {
    try {
      standardIlcWeights(f64([1, 2, 2, 1]), f64([1, 1]), "ell window 3");
      expect.unreachable();
    } catch (e) {
      expect(isUmbraError(e, "BAD_DATA")).toBe(true);
      expect(String(e)).toContain("ell window 3");
    }
  });

  it("reject degenerate constraints and more constraints than bands", () => {
    const cov = f64([2, 0.5, 0.5, 1]);
    expect(() => constrainedIlcWeights(cov, [f64([1, 2]), f64([2, 4])])).toThrow(/degenerate/);
    expect(() => constrainedIlcWeights(cov, [f64([1, 2]), f64([1, 1]), f64([0, 1])])).toThrow(/at least 3 bands/);
  });
});

describe("covariance checks", () => {
  it("report positive definiteness and the condition number", () => {
    const c = checkCovariance(f64([1, 0, 0, 100]));
    expect(c.positiveDefinite).toBe(true);
    expect(c.conditionNumber).toAllClose(100, { rtol: 1e-12 });
    expect(c.correlationConditionNumber).toAllClose(1, { rtol: 1e-12 });
    // eigenvalues of [[1, 2], [2, 1]] are 3 and −1 (hand-solved)
    const bad = checkCovariance(f64([1, 2, 2, 1]));
    expect(bad.positiveDefinite).toBe(false);
    expect([bad.eigenvalueMin, bad.eigenvalueMax]).toAllClose([-1, 3], { rtol: 1e-12 });
    expect(bad.conditionNumber).toBe(Infinity);
  });
});

describe("ILC bias bookkeeping", () => {
  it("is (m − k)/N_p (Delabrouille et al. 2009, A&A 493, 835)", () => {
    expect(ilcBiasFraction(3, 1, 200)).toAllClose(0.01, { rtol: 1e-15 });
    expect(ilcBiasFraction(5, 3, 100)).toAllClose(0.02, { rtol: 1e-15 });
    expect(ilcBiasFraction(3, 1, 0)).toBe(Infinity);
  });

  it("counts effective modes with Kish's formula", () => {
    // equal weights: N = Σ d (Kish 1965, Survey Sampling, §11.7)
    expect(effectiveModeCount(f64([1, 2, 2, 1]), f64([3, 3, 3, 3]))).toAllClose(6, { rtol: 1e-15 });
    // weights (1, 0, 1, 1) on dof (1, 2, 2, 1): (1+2+1)² / (1+2+1) = 4
    expect(effectiveModeCount(f64([1, 2, 2, 1]), f64([1, 0, 1, 1]))).toAllClose(4, { rtol: 1e-15 });
  });

  it("reduces the mode count by ⟨w²⟩²/⟨w⁴⟩ for an apodisation window", () => {
    expect(apodisationModeFactor(f64([1, 1, 1, 1]))).toAllClose(1, { rtol: 1e-15 });
    // w = (1, 1, 0, 0): ⟨w²⟩ = 1/2, ⟨w⁴⟩ = 1/2 ⇒ 1/2 (a half-sky cut)
    expect(apodisationModeFactor(f64([1, 1, 0, 0]))).toAllClose(0.5, { rtol: 1e-15 });
  });
});
