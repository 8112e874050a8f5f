/**
 * Sky tiles (src/tiles/): the plan covers every pixel once, a cut stack keeps the sky coordinates of
 * every pixel, a one-tile plan reproduces the untiled measure and search exactly, and a tiled run
 * measures every cluster once and finds the bright ones near their true positions (invented field).
 */
import { describe, expect, it } from "vitest";
import { UmbraError } from "@umbra/core";
import { pixelToWorld } from "@umbra/maps";
import { measureClusters } from "../src/photometry/measure.js";
import { searchClusters } from "../src/search/blind.js";
import { gaussianShape } from "../src/mmf/profile.js";
import type { CatalogueCluster, SedProvider } from "../src/photometry/types.js";
import { cutStack, owningTile, planTiles } from "../src/tiles/plan.js";
import { joinTileMeasurements, measureTile, placeClusters } from "../src/tiles/measure.js";
import { joinTileSearches, searchTile } from "../src/tiles/search.js";
import { BANDS3, makeField, tszNonRel, type FieldCluster } from "./photometry-helpers.js";

const sed = Float64Array.from(BANDS3.map((b) => tszNonRel(b.frequencyGHz)));
const seds: SedProvider = {
  tsz: (kte) => {
    if (kte !== 0) throw new Error("relativistic SED not available in this test");
    return sed;
  },
  ksz: () => Float64Array.from(BANDS3.map(() => -2.7255)),
};

describe("tile plan", () => {
  it("partitions the map into near-equal cores and grows each by the margin, clipped to the map", () => {
    const tiles = planTiles(250, 130, 0.5, { tileDeg: 1, marginArcmin: 10 });
    // 250 px × 0.5′ = 2.08° → 3 cores along x; 130 px → 2 along y
    expect(tiles.length).toBe(6);
    const seen = new Uint8Array(250 * 130);
    for (const t of tiles) {
      for (let y = t.core.y0; y < t.core.y1; y++) for (let x = t.core.x0; x < t.core.x1; x++) seen[y * 250 + x]! += 1;
      expect(t.outer.x0).toBe(Math.max(0, t.core.x0 - 20));
      expect(t.outer.x1).toBe(Math.min(250, t.core.x1 + 20));
      expect(t.outer.y0).toBe(Math.max(0, t.core.y0 - 20));
      expect(t.outer.y1).toBe(Math.min(130, t.core.y1 + 20));
      expect(t.core.x1 - t.core.x0).toBeGreaterThanOrEqual(83);
      expect(t.core.x1 - t.core.x0).toBeLessThanOrEqual(84);
    }
    expect(seen.every((v) => v === 1)).toBe(true);
  });

  it("gives off-map and non-finite positions to the tile of the nearest pixel (tile 0 when not finite)", () => {
    const tiles = planTiles(200, 200, 0.5, { tileDeg: 1, marginArcmin: 5 });
    expect(owningTile(tiles, 200, 200, -50, -50)).toBe(0);
    expect(owningTile(tiles, 200, 200, 500, 500)).toBe(3);
    expect(owningTile(tiles, 200, 200, NaN, 3)).toBe(0);
    expect(owningTile(tiles, 200, 200, 150.2, 20.4)).toBe(1);
  });

  it("refuses a non-positive tile side with BAD_OPTION", () => {
    expect(() => planTiles(100, 100, 0.5, { tileDeg: 0, marginArcmin: 5 })).toThrow(UmbraError);
  });
});

describe("cut stack", () => {
  const stack = makeField(128, 0.5, BANDS3, [], 5);
  const box = { x0: 17, y0: 40, x1: 100, y1: 121 };
  const sub = cutStack(stack, box);

  it("keeps every pixel's value and sky position (shifted reference pixel)", () => {
    expect(sub.nx).toBe(83);
    expect(sub.ny).toBe(81);
    expect(sub.bands[1]!.data[5 * 83 + 7]).toBe(stack.bands[1]!.data[45 * 128 + 24]);
    for (const [x, y] of [[0, 0], [82.4, 80.7], [30.25, 12.5]] as const) {
      const a = pixelToWorld(sub.wcs!, x, y);
      const b = pixelToWorld(stack.wcs!, x + box.x0, y + box.y0);
      expect([a.lonDeg, a.latDeg]).toAllClose([b.lonDeg, b.latDeg], { rtol: 0, atol: 1e-12 });
    }
  });

  it("refuses a box outside the map", () => {
    expect(() => cutStack(stack, { x0: 0, y0: 0, x1: 129, y1: 10 })).toThrow(/not inside/);
  });
});

describe("tiled measure and search on an invented 3-band field", () => {
  const n = 256;
  const truth: FieldCluster[] = [];
  for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) truth.push({ id: `K${i}${j}`, px: 40.3 + 58 * i, py: 39.6 + 58 * j, sigmaArcmin: 1.2, y0: 3e-4 });
  const stack = makeField(n, 0.5, BANDS3, truth, 21);
  const cat: CatalogueCluster[] = truth.map((c) => {
    const w = pixelToWorld(stack.wcs!, c.px, c.py);
    return { id: c.id, raDeg: w.lonDeg, decDeg: w.latDeg, theta500Arcmin: c.sigmaArcmin };
  });
  const opts = { profile: gaussianShape(1), seds, randomCount: 0, maxIterations: 1 };
  const measure = (s: typeof stack, c: readonly CatalogueCluster[]) => measureClusters(s, c, opts);

  it("reproduces the untiled measurement exactly when one tile covers the map", () => {
    const tiles = planTiles(n, n, 0.5, { tileDeg: 5, marginArcmin: 10 });
    expect(tiles.length).toBe(1);
    const whole = measureClusters(stack, cat, opts).clusters;
    const part = measureTile(stack, cat, placeClusters(stack, tiles, cat), tiles[0]!, measure);
    expect(joinTileMeasurements(cat.length, [part])).toEqual(whole);
  });

  it("measures each cluster once across 4 tiles, in catalogue order, near the truth", () => {
    const tiles = planTiles(n, n, 0.5, { tileDeg: 1.1, marginArcmin: 20 });
    expect(tiles.length).toBe(4);
    const placement = placeClusters(stack, tiles, cat);
    const parts = tiles.map((t) => measureTile(stack, cat, placement, t, measure));
    expect(parts.map((p) => p.rows.length)).toEqual([4, 4, 4, 4]);
    const joined = joinTileMeasurements(cat.length, parts);
    expect(joined.map((m) => m.id)).toEqual(cat.map((c) => c.id));
    joined.forEach((m, k) => {
      expect([m.px, m.py]).toAllClose([truth[k]!.px, truth[k]!.py], { rtol: 0, atol: 1e-6 });
      expect(Math.abs(m.y0 - 3e-4)).toBeLessThan(5 * m.y0Err);
    });
    expect(() => joinTileMeasurements(cat.length, parts.slice(1))).toThrow(/no tile reported catalogue rows 1, 2, 5, 6$/);
  });

  it("reproduces the untiled search exactly with one tile, and finds every cluster once with 4", () => {
    const sopts = { profile: gaussianShape(1), tszSed: sed, sizesArcmin: [0.8, 1.2, 1.8], maxIterations: 1, snrMin: 5 };
    const one = planTiles(n, n, 0.5, { tileDeg: 5, marginArcmin: 10 });
    const whole = searchClusters(stack, sopts);
    expect(joinTileSearches(1, [searchTile(stack, one[0]!, sopts)])).toEqual(whole.candidates);
    const tiles = planTiles(n, n, 0.5, { tileDeg: 1.1, marginArcmin: 20 });
    const parts = tiles.map((t) => searchTile(stack, t, sopts));
    const cands = joinTileSearches(tiles.length, parts);
    for (const t of truth) expect(cands.filter((c) => (c.px - t.px) ** 2 + (c.py - t.py) ** 2 < 9).length, t.id).toBe(1);
    expect(cands.map((c) => c.id)).toEqual(cands.map((_, k) => `cand-${String(k + 1).padStart(4, "0")}`));
    for (let k = 1; k < cands.length; k++) expect(cands[k]!.snrRaw).toBeLessThanOrEqual(cands[k - 1]!.snrRaw);
    expect(() => joinTileSearches(tiles.length, parts.slice(0, 3))).toThrow(/tiles 3 of 4/);
  });

  it("flags the clusters of a tile without data (outside the footprint) and goes on with the others", () => {
    const holed = { ...stack, bands: stack.bands.map((b) => ({ ...b, data: b.data.map((v, p) => (p % n < 168 && Math.floor(p / n) < 168 ? NaN : v)) })) };
    const tiles = planTiles(n, n, 0.5, { tileDeg: 1.1, marginArcmin: 20 });
    const placement = placeClusters(holed, tiles, cat);
    const parts = tiles.map((t) => measureTile(holed, cat, placement, t, (s, c) => measureClusters(s, c, opts)));
    expect(parts.map((p) => p.noData)).toEqual([true, false, false, false]);
    const joined = joinTileMeasurements(cat.length, parts);
    for (const k of parts[0]!.rows) {
      expect(joined[k]!.flags).toEqual(["masked"]);
      expect(Number.isNaN(joined[k]!.y0)).toBe(true);
    }
    const far = joined[cat.findIndex((c) => c.id === "K33")]!;
    expect(Math.abs(far.y0 - 3e-4)).toBeLessThan(5 * far.y0Err);
    const sopts = { profile: gaussianShape(1), tszSed: sed, sizesArcmin: [1.2], maxIterations: 0, snrMin: 5 };
    expect(searchTile(holed, tiles[0]!, sopts)).toEqual({ tile: 0, candidates: [], diagnostics: null, noData: true });
  });
});
