import { describe, expect, it } from "vitest";
import { createRng, logFactorial } from "../src/index.js";

describe("createRng", () => {
  it("gives the same sequence for the same seed and a different one for another seed", () => {
    const a = createRng(42), b = createRng(42), c = createRng(43);
    const xa = [a.uniform(), a.normal(), a.uniform()];
    expect([b.uniform(), b.normal(), b.uniform()]).toEqual(xa);
    expect(c.uniform()).not.toBe(xa[0]);
  });
  it("forks streams deterministically and independently of draw order", () => {
    const a = createRng(7);
    a.uniform();
    expect(a.fork("band:f090").uniform()).toBe(createRng(7).fork("band:f090").uniform());
    expect(a.fork(1).uniform()).not.toBe(a.fork(2).uniform());
  });
  it("draws uniforms in [0,1) with mean 1/2 and variance 1/12 (common practice, no source)", () => {
    const r = createRng(1);
    const n = 200_000;
    let s = 0, s2 = 0, min = 1, max = 0;
    for (let i = 0; i < n; i++) { const u = r.uniform(); s += u; s2 += u * u; min = Math.min(min, u); max = Math.max(max, u); }
    const mean = s / n, variance = s2 / n - mean * mean;
    expect(min).toBeGreaterThanOrEqual(0);
    expect(max).toBeLessThan(1);
    expect(Math.abs(mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(variance).toAllClose(1 / 12, { rtol: 0.01 });
  });
  it("draws normals with mean 0, variance 1 and kurtosis 3 (moments of N(0,1), common practice)", () => {
    const r = createRng(2);
    const x = r.fillNormal(new Float64Array(400_000));
    let s = 0, s2 = 0, s4 = 0;
    for (const v of x) { s += v; s2 += v * v; s4 += v ** 4; }
    const n = x.length;
    expect(Math.abs(s / n)).toBeLessThan(5 / Math.sqrt(n));
    expect(s2 / n).toAllClose(1, { rtol: 0.01 });
    expect(s4 / n).toAllClose(3, { rtol: 0.03 });
  });
  it.each([0.5, 4, 30, 1000])("draws Poisson(%f) with mean and variance lambda (common practice)", (lam) => {
    const r = createRng(3);
    const n = 100_000;
    let s = 0, s2 = 0, nonInteger = 0;
    for (let i = 0; i < n; i++) { const k = r.poisson(lam); if (!Number.isInteger(k) || k < 0) nonInteger++; s += k; s2 += k * k; }
    expect(nonInteger).toBe(0);
    const mean = s / n, variance = s2 / n - mean * mean;
    expect(Math.abs(mean - lam)).toBeLessThan(5 * Math.sqrt(lam / n));
    expect(variance).toAllClose(lam, { rtol: 0.03 });
  });
  it("rejects a negative Poisson mean and a non-integer seed", () => {
    expect(() => createRng(1).poisson(-1)).toThrow(/Poisson/);
    expect(() => createRng(1.5)).toThrow(/integer/);
  });
});

describe("logFactorial", () => {
  it("matches ln(k!) from exact products (from memory: 20! = 2432902008176640000)", () => {
    expect(logFactorial(0)).toBe(0);
    expect(logFactorial(5)).toAllClose(Math.log(120), { rtol: 1e-14 });
    expect(logFactorial(20)).toAllClose(Math.log(2432902008176640000), { rtol: 1e-12 });
  });
});
