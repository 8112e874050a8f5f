import { describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import { cutout, fieldSizeDeg, flatGeometry, pixelAreaSr, pixelSizeArcmin } from "../src/geometry/index.js";
import { pixelToWorld, wcsFromHeader, worldToPixel } from "../src/wcs/index.js";
import type { SkyMap } from "../src/types.js";

const header = (cards: Record<string, string | number>) => ({ get: (k: string) => cards[k] });

function rampMap(nx: number, ny: number, cards: Record<string, string | number>): SkyMap {
  const data = new Float64Array(nx * ny);
  for (let k = 0; k < data.length; k++) data[k] = k;
  return { data, nx, ny, wcs: wcsFromHeader(header(cards)), unit: "uK_CMB" };
}

const car = { CTYPE1: "RA---CAR", CTYPE2: "DEC--CAR", CRVAL1: 30, CRVAL2: 0, CRPIX1: 50.5, CRPIX2: 40.5, CDELT1: -0.5 / 60, CDELT2: 0.5 / 60 };

describe("flatGeometry", () => {
  it("takes pixel sides from the CD columns at the reference point, in radians", () => {
    const g = flatGeometry(rampMap(100, 80, car));
    expect([g.nx, g.ny]).toEqual([100, 80]);
    expect([g.dxRad, g.dyRad]).toAllClose([(0.5 / 60) * (Math.PI / 180), (0.5 / 60) * (Math.PI / 180)], { rtol: 1e-15 });
    expect(pixelAreaSr(g)).toAllClose(((0.5 / 60) * (Math.PI / 180)) ** 2, { rtol: 1e-15 });
    const f = fieldSizeDeg(g);
    expect([f.widthDeg, f.heightDeg, f.areaDeg2]).toAllClose([100 / 120, 80 / 120, (100 * 80) / 14400], { rtol: 1e-14 });
  });

  it("gives the same pixel size for a rotated grid, and matches the sky distance between neighbours", () => {
    const rot = { CTYPE1: "RA---TAN", CTYPE2: "DEC--TAN", CRVAL1: 150, CRVAL2: 2, CRPIX1: 10, CRPIX2: 10, CDELT1: -0.01, CDELT2: 0.01, CROTA2: 37 };
    const m = rampMap(20, 20, rot);
    expect([pixelSizeArcmin(m.wcs!).dxArcmin, pixelSizeArcmin(m.wcs!).dyArcmin]).toAllClose([0.6, 0.6], { rtol: 1e-14 });
    // sky distance between the reference pixel and its +x neighbour (haversine; common practice)
    const a = pixelToWorld(m.wcs!, 9, 9);
    const b = pixelToWorld(m.wcs!, 10, 9);
    const r = Math.PI / 180;
    const h = Math.sin(((b.latDeg - a.latDeg) * r) / 2) ** 2 + Math.cos(a.latDeg * r) * Math.cos(b.latDeg * r) * Math.sin(((b.lonDeg - a.lonDeg) * r) / 2) ** 2;
    expect(2 * Math.asin(Math.sqrt(h))).toAllClose(flatGeometry(m).dxRad, { rtol: 1e-6 });
  });

  it("refuses a map without WCS and a skewed pixel grid (BAD_WCS)", () => {
    expect(() => flatGeometry({ data: new Float64Array(4), nx: 2, ny: 2, wcs: null })).toThrow(/no celestial WCS/);
    const skew = rampMap(4, 4, { ...car, CDELT1: undefined as unknown as number, CD1_1: -0.01, CD1_2: 0.002, CD2_1: 0, CD2_2: 0.01 });
    try {
      flatGeometry(skew);
      expect.unreachable();
    } catch (e) {
      expect(isUmbraError(e, "BAD_WCS")).toBe(true);
    }
  });
});

describe("cutout", () => {
  const m = rampMap(100, 80, car);

  it("copies the pixels around the nearest pixel and shifts CRPIX so sky positions are unchanged", () => {
    const target = pixelToWorld(m.wcs!, 30.2, 20.4);
    const c = cutout(m, target.lonDeg, target.latDeg, 11, 9);
    expect([c.x0, c.y0, c.nx, c.ny, c.complete, c.unit]).toEqual([25, 16, 11, 9, true, "uK_CMB"]);
    expect(c.data[0]).toBe(16 * 100 + 25);
    expect(c.data[4 * 11 + 5]).toBe(20 * 100 + 30);
    expect([c.centerIx, c.centerIy]).toAllClose([5.2, 4.4], { atol: 1e-9 });
    expect(c.wcs!.crpix).toEqual([50.5 - 25, 40.5 - 16]);
    const p = worldToPixel(c.wcs!, target.lonDeg, target.latDeg);
    expect([p.ix, p.iy]).toAllClose([5.2, 4.4], { atol: 1e-9 });
  });

  it("fills the part beyond the map edge with NaN and flags it incomplete", () => {
    const w = pixelToWorld(m.wcs!, 1, 78);
    const c = cutout(m, w.lonDeg, w.latDeg, 6, 6);
    expect(c.complete).toBe(false);
    expect([c.x0, c.y0]).toEqual([-2, 75]);
    expect(c.data[0]).toBeNaN(); // parent x = −2
    expect(c.data[2]).toBe(75 * 100); // parent (0, 75)
    expect(c.data[5 * 6 + 3]).toBeNaN(); // parent y = 80
    expect(() => cutout(m, w.lonDeg, w.latDeg, 6, 6, { requireComplete: true })).toThrow(/extends past the map edge/);
  });

  it("cuts across RA = 0/360 with positions given either side of the wrap", () => {
    const wrap = rampMap(60, 60, { CTYPE1: "RA---TAN", CTYPE2: "DEC--TAN", CRVAL1: 0.05, CRVAL2: -30, CRPIX1: 30.5, CRPIX2: 30.5, CDELT1: -0.01, CDELT2: 0.01 });
    const a = cutout(wrap, 359.98, -30, 5, 5);
    const b = cutout(wrap, -0.02, -30, 5, 5);
    expect([a.x0, a.y0]).toEqual([b.x0, b.y0]);
    expect(a.x0).toBe(34); // ΔRA = −0.07° → +0.07·cos 30° / 0.01 = 6.06 pixels east of CRPIX1 − 1 = 29.5 → nearest 36, minus 2
    expect(a.complete).toBe(true);
    const east = pixelToWorld(wrap.wcs!, 59, 29.5);
    expect(east.lonDeg).toBeGreaterThan(359); // the map's right-hand side lies at RA just below 360
  });

  it("throws BAD_VALUE when the position is off the map or the size is not a positive integer", () => {
    for (const f of [() => cutout(m, 200, 0, 5, 5), () => cutout(m, 30, 0, 0, 5), () => cutout(m, 30, 0, 2.5, 5)]) {
      try {
        f();
        expect.unreachable();
      } catch (e) {
        expect(isUmbraError(e, "BAD_VALUE")).toBe(true);
      }
    }
  });
});
