import { describe, expect, it } from "vitest";
import { gaussKronrod15, integrate } from "../src/numerics/quadrature.js";

describe("Gauss–Kronrod quadrature", () => {
  it("integrates polynomials up to degree 22 exactly on one panel (Kronrod 15-point degree 3n+1)", () => {
    for (let k = 0; k <= 22; k++) {
      const [v] = gaussKronrod15((x) => x ** k, 0, 1);
      expect(v).toAllClose(1 / (k + 1), { rtol: 1e-13 });
    }
  });
  it("integrates exp and a peaked function to 1e-10 adaptively", () => {
    expect(integrate(Math.exp, 0, 3)).toAllClose(Math.exp(3) - 1, { rtol: 1e-12 });
    // ∫ dx/(1e-4 + x²) over [-1, 1] = 2/ε atan(1/ε), ε = 1e-2 (elementary)
    expect(integrate((x) => 1 / (1e-4 + x * x), -1, 1)).toAllClose(200 * Math.atan(100), { rtol: 1e-10 });
  });
  it("reports a NUMERIC error when the panel budget is exhausted", () => {
    expect(() => integrate((x) => Math.sin(1 / x), 1e-9, 1, { maxPanels: 20 })).toThrow(/quadrature/);
  });
});
