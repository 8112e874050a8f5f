import { describe, expect, it } from "vitest";
import { UmbraError, isUmbraError, requireFinite, fwhmToSigma, arcminToRad, radToArcmin } from "../src/index.js";

describe("UmbraError", () => {
  it("names the file, HDU and keyword in its message", () => {
    const e = new UmbraError("BAD_FITS", "missing END card", { file: "a.fits", hdu: 1, keyword: "END" });
    expect(e.message).toBe("a.fits, HDU 1, keyword END: missing END card");
    expect(isUmbraError(e, "BAD_FITS")).toBe(true);
    expect(isUmbraError(e, "BAD_WCS")).toBe(false);
    expect(isUmbraError(new Error("x"))).toBe(false);
  });
  it("requireFinite rejects NaN and values failing the predicate", () => {
    expect(requireFinite("z", 0.5, (v) => v >= 0)).toBe(0.5);
    expect(() => requireFinite("z", -1, (v) => v >= 0, "negative")).toThrow(/z = -1 is negative/);
    expect(() => requireFinite("m500", NaN)).toThrow(/not a finite number/);
  });
});

describe("angle helpers", () => {
  it("FWHM = sqrt(8 ln 2) sigma ≈ 2.35482 sigma (Gaussian identity, common practice)", () => {
    expect(fwhmToSigma(2.3548200450309493)).toAllClose(1, { rtol: 1e-15 });
  });
  it("round-trips arcmin and radians (1 arcmin = pi/10800 rad)", () => {
    expect(arcminToRad(10800)).toAllClose(Math.PI, { rtol: 1e-15 });
    expect(radToArcmin(arcminToRad(3.7))).toAllClose(3.7, { rtol: 1e-15 });
  });
});
