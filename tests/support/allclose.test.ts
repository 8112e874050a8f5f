import { describe, expect, it } from "vitest";
import { allCloseMismatch } from "./allclose.js";

describe("toAllClose (numpy assert_allclose semantics: |a-e| <= atol + rtol|e|)", () => {
  it("passes within relative tolerance and fails outside it", () => {
    expect(allCloseMismatch(1.0000001, 1, { rtol: 1e-6 })).toBeNull();
    expect(allCloseMismatch(1.00001, 1, { rtol: 1e-6 })).toMatch(/not close/);
  });
  it("uses atol near zero", () => {
    expect(allCloseMismatch(1e-12, 0, { rtol: 1e-6 })).not.toBeNull();
    expect(allCloseMismatch(1e-12, 0, { rtol: 1e-6, atol: 1e-10 })).toBeNull();
  });
  it("compares typed arrays element-wise and reports the worst element", () => {
    const msg = allCloseMismatch(new Float64Array([1, 2, 3.5]), [1, 2, 3], { rtol: 1e-3 });
    expect(msg).toMatch(/\[2\]/);
    expect(new Float64Array([1, 2, 3])).toAllClose([1, 2, 3 + 1e-12], { rtol: 1e-10 });
  });
  it("treats NaN as equal to NaN by default, not to numbers", () => {
    expect(allCloseMismatch([NaN], [NaN])).toBeNull();
    expect(allCloseMismatch([NaN], [1])).not.toBeNull();
    expect(allCloseMismatch([NaN], [NaN], { equalNan: false })).not.toBeNull();
  });
  it("rejects length mismatches", () => {
    expect(allCloseMismatch([1, 2], [1, 2, 3])).toMatch(/length/);
  });
});
