import { describe, expect, it } from "vitest";
import { pixelToWorld } from "@umbra/maps";
import { measureClusters } from "../src/photometry/measure.js";
import { covarianceFromNoiseSimulations } from "../src/photometry/noiseSims.js";
import { gaussianShape } from "../src/mmf/profile.js";
import type { CatalogueCluster, SedProvider } from "../src/photometry/types.js";
import { BANDS3, makeField, tszNonRel, type FieldCluster } from "./photometry-helpers.js";

const seds: SedProvider = {
  tsz: (kte) => {
    if (kte !== 0) throw new Error("relativistic SED not available in this test");
    return Float64Array.from(BANDS3.map((b) => tszNonRel(b.frequencyGHz)));
  },
  ksz: () => Float64Array.from(BANDS3.map(() => -2.7255)),
};

function catalogue(stackWcs: NonNullable<ReturnType<typeof makeField>["wcs"]>, cl: FieldCluster[]): CatalogueCluster[] {
  return cl.map((c) => {
    const w = pixelToWorld(stackWcs, c.px, c.py);
    return { id: c.id, raDeg: w.lonDeg, decDeg: w.latDeg, theta500Arcmin: c.sigmaArcmin };
  });
}

describe("forced photometry on an invented 3-band field", () => {
  const n = 256;
  const truth: FieldCluster[] = [];
  for (let i = 0; i < 5; i++) for (let j = 0; j < 5; j++) truth.push({ id: `T${i}${j}`, px: 40.3 + 44 * i, py: 39.6 + 44 * j, sigmaArcmin: 1 + 0.25 * ((i + j) % 4), y0: 1e-4 * (1 + ((3 * i + j) % 5)) });
  const stack = makeField(n, 0.5, BANDS3, truth, 11);
  const cat = catalogue(stack.wcs!, truth);
  const res = measureClusters(stack, cat, { profile: gaussianShape(1), seds, randomCount: 200, exclusionArcmin: 6 });

  it("recovers y0 with pulls of unit scale and errors close to the random-position scatter", () => {
    const pulls = res.clusters.map((c, k) => (c.y0 - truth[k]!.y0) / c.y0Err);
    expect(pulls.every(Number.isFinite)).toBe(true);
    const mean = pulls.reduce((a, b) => a + b, 0) / pulls.length;
    const sd = Math.sqrt(pulls.reduce((a, b) => a + (b - mean) ** 2, 0) / (pulls.length - 1));
    // 25 clusters: the mean pull has standard error 0.2 and the sd ≈ 14 %
    expect(Math.abs(mean)).toBeLessThan(0.7);
    expect(sd).toBeGreaterThan(0.6);
    expect(sd).toBeLessThan(1.45);
    for (const r of res.diagnostics.randomScatter) expect(r.sigmaRandom).toAllClose(r.sigmaAnalytic, { rtol: 0.15 }); // 200 correlated draws: ~8 % sampling error
  });

  it("reports Y5R500 as y0 times the profile integral and S/N as y0 over its error", () => {
    const c = res.clusters[7]!;
    // Gaussian shape: ∫τ d²θ = 2π σ² (textbook integral)
    expect(c.yArcmin2).toAllClose(c.y0 * 2 * Math.PI * c.theta500Arcmin ** 2, { rtol: 1e-3 });
    expect(c.yErrArcmin2 / c.yArcmin2).toAllClose(c.y0Err / c.y0, { rtol: 1e-12 });
    expect(c.snr).toAllClose(c.y0 / c.y0Err, { rtol: 1e-12 });
  });

  it("converges the cluster-cleaned covariance within a few iterations", () => {
    expect(res.diagnostics.iterations).toBeGreaterThanOrEqual(1);
    expect(res.diagnostics.lastChangeSigma).toBeLessThan(0.05);
  });

  it("flags off-map, edge and masked clusters with NaNs and still measures the rest", () => {
    const extra: CatalogueCluster[] = [
      { id: "OFF", raDeg: 10, decDeg: -40, theta500Arcmin: 2 },
      { id: "EDGE", ...(() => { const w = pixelToWorld(stack.wcs!, 3, 128); return { raDeg: w.lonDeg, decDeg: w.latDeg }; })(), theta500Arcmin: 2 },
    ];
    const masked = { ...stack, bands: stack.bands.map((b, i) => (i === 1 ? { ...b, mask: (() => { const m = new Uint8Array(n * n).fill(1); for (let y = 120; y < 136; y++) for (let x = 120; x < 136; x++) m[y * n + x] = 0; return m; })() } : b)) };
    const w = pixelToWorld(stack.wcs!, 128, 128);
    const r = measureClusters(masked, [...cat.slice(0, 3), ...extra, { id: "MASK", raDeg: w.lonDeg, decDeg: w.latDeg, theta500Arcmin: 1.5 }], { profile: gaussianShape(1), seds, randomCount: 0 });
    const byId = new Map(r.clusters.map((c) => [c.id, c]));
    expect(byId.get("OFF")!.flags).toContain("off_map");
    expect(byId.get("EDGE")!.flags).toContain("edge");
    expect(byId.get("MASK")!.flags).toContain("masked");
    for (const id of ["OFF", "EDGE", "MASK"]) expect(Number.isNaN(byId.get(id)!.y0)).toBe(true);
    expect(r.clusters.slice(0, 3).every((c) => Number.isFinite(c.y0) && c.flags.length === 0)).toBe(true);
  });

  it("uses a covariance from noise-only simulations when given one", () => {
    const sims = [21, 22, 23].map((seed) => makeField(n, 0.5, BANDS3, [], seed));
    const noiseCovariance = covarianceFromNoiseSimulations(sims);
    const r = measureClusters(stack, cat, { profile: gaussianShape(1), seds, randomCount: 0, noiseCovariance });
    expect(r.diagnostics.covarianceSource).toBe("simulations");
    const pulls = r.clusters.map((c, k) => (c.y0 - truth[k]!.y0) / c.y0Err);
    const mean = pulls.reduce((a, b) => a + b, 0) / pulls.length;
    const sd = Math.sqrt(pulls.reduce((a, b) => a + (b - mean) ** 2, 0) / (pulls.length - 1));
    expect(sd).toBeGreaterThan(0.6);
    expect(sd).toBeLessThan(1.45);
    // the errors agree with the data-estimated ones within 10 % (same noise model)
    r.clusters.forEach((c, k) => expect(c.y0Err).toAllClose(res.clusters[k]!.y0Err, { rtol: 0.1 }));
  });

  it("scans sizes when theta500 is missing and picks a size near the true one for a bright cluster", () => {
    const bright = [{ id: "B1", px: 128.2, py: 127.7, sigmaArcmin: 2, y0: 6e-4 }];
    const s2 = makeField(n, 0.5, BANDS3, bright, 5);
    const w = pixelToWorld(s2.wcs!, 128.2, 127.7);
    const r = measureClusters(s2, [{ id: "B1", raDeg: w.lonDeg, decDeg: w.latDeg }], { profile: gaussianShape(1), seds, randomCount: 0 });
    const c = r.clusters[0]!;
    expect(c.thetaSource).toBe("scan");
    expect(c.scan!.length).toBe(15);
    expect(c.theta500Arcmin).toBeGreaterThan(1.3);
    expect(c.theta500Arcmin).toBeLessThan(3.0);
  });
});
