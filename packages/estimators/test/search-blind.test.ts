import { describe, expect, it } from "vitest";
import { searchClusters } from "../src/search/blind.js";
import { debiasedSnr } from "../src/search/debias.js";
import { deblendPeaks, findPeaks } from "../src/search/peaks.js";
import { gaussianShape } from "../src/mmf/profile.js";
import { BANDS3, makeField, tszNonRel, type FieldCluster } from "./photometry-helpers.js";

describe("peak finding", () => {
  it("finds a parabolic peak at its sub-pixel vertex with a curvature-based position error", () => {
    const nx = 9, ny = 9;
    const m = new Float64Array(nx * ny);
    // ξ(x, y) = 10 − 0.5·((x − 4.3)² + (y − 3.8)²): vertex (4.3, 3.8), second difference −1
    for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) m[y * nx + x] = 10 - 0.5 * ((x - 4.3) ** 2 + (y - 3.8) ** 2);
    const [p] = findPeaks(m, nx, ny, 5, null);
    expect([p!.px, p!.py]).toAllClose([4.3, 3.8], { rtol: 1e-12 });
    // σ = 1/sqrt(ξ0·|Δ²ξ|) with ξ0 the pixel value at (4, 4)
    expect(p!.positionErrPix).toAllClose(1 / Math.sqrt(m[4 * nx + 4]!), { rtol: 1e-12 });
  });

  it("keeps the stronger of two peaks closer than the radius and both when farther", () => {
    const peaks = [{ px: 10, py: 10, snr: 9 }, { px: 12, py: 10, snr: 6 }, { px: 30, py: 10, snr: 5 }];
    expect(deblendPeaks(peaks, () => 5).map((p) => p.snr)).toEqual([9, 5]);
    expect(deblendPeaks(peaks, () => 1).length).toBe(3);
  });
});

describe("debiased S/N", () => {
  it("inverts <xi> = sqrt(zeta^2 + 3) (Vanderlinde et al. 2010, ApJ 722, 1180)", () => {
    expect(debiasedSnr(Math.sqrt(25 + 3))).toAllClose(5, { rtol: 1e-12 });
    expect(debiasedSnr(1.5)).toBe(0);
  });
});

describe("blind search on an invented 3-band field", () => {
  const truth: FieldCluster[] = [
    { id: "A", px: 60.2, py: 70.7, sigmaArcmin: 1.5, y0: 4e-4 },
    { id: "B", px: 180.6, py: 90.1, sigmaArcmin: 2.5, y0: 2e-4 },
    { id: "C", px: 120.3, py: 190.4, sigmaArcmin: 1.0, y0: 3e-4 },
  ];
  const stack = makeField(256, 0.5, BANDS3, truth, 3);
  const sed = Float64Array.from(BANDS3.map((b) => tszNonRel(b.frequencyGHz)));
  const res = searchClusters(stack, { profile: gaussianShape(1), tszSed: sed, sizesArcmin: [0.7, 1, 1.5, 2.2, 3.2, 4.5] });

  it("finds every bright cluster near its true position and nothing else above 5", () => {
    for (const t of truth) {
      const hit = res.candidates.find((c) => (c.px - t.px) ** 2 + (c.py - t.py) ** 2 < 9);
      expect(hit, `cluster ${t.id}`).toBeDefined();
      expect(hit!.snrRaw).toBeGreaterThan(6);
      expect(Math.abs(hit!.y0 - t.y0)).toBeLessThan(4 * hit!.y0Err + 0.1 * t.y0);
    }
    expect(res.candidates.filter((c) => c.snrRaw >= 5).length).toBe(3);
    expect(res.diagnostics.thresholdUses).toBe("raw");
    for (const c of res.candidates) expect(c.snrDebiased).toAllClose(Math.sqrt(c.snrRaw ** 2 - 3), { rtol: 1e-12 });
  });
});
