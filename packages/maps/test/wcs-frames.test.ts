/**
 * ICRS / FK5 (J2000) / Galactic conversions and reprojection between frames, against astropy 5.2.1
 * (`SkyCoord(...).galactic`, `.icrs`, `.fk5`, and astropy.wcs for the grids), from
 * fixtures/wcs-frames/make_reference.py → reference.json.
 * Tolerances: 1e-9 deg of angular separation on the sky, 1e-7 pixel on the source grids
 * (pixels of 0.5′–3′, so 1e-7 pixel is below 1e-9 deg).
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { isUmbraError } from "@umbra/core";
import { planPixelMapping, reproject, targetToSourcePixel } from "../src/reproject/index.js";
import {
  frameRotation,
  galacticToIcrsDeg,
  icrsToGalacticDeg,
  multiply3,
  pixelToWorld,
  pixelToWorldArray,
  rotateLonLat,
  transpose3,
  wcsFromHeader,
  type ConvertibleFrame,
} from "../src/wcs/index.js";
import type { Wcs } from "../src/wcs/types.js";
import type { SkyMap } from "../src/types.js";

interface LonLat {
  lon_deg: number[];
  lat_deg: number[];
}
interface PointSet extends LonLat {
  from: ConvertibleFrame;
  ICRS: LonLat;
  FK5: LonLat;
  GALACTIC: LonLat;
}
interface GridCase {
  name: string;
  target: { header: Record<string, string | number>; frame: string };
  source: { header: Record<string, string | number>; frame: string };
  ix: number[];
  iy: number[];
  source_lon_deg: number[];
  source_lat_deg: number[];
  source_ix: number[];
  source_iy: number[];
}

const REF = JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/wcs-frames/reference.json", import.meta.url)), "utf8")) as {
  library: Record<string, string>;
  points: PointSet[];
  grids: GridCase[];
};

const D2R = Math.PI / 180;
const FRAMES: ConvertibleFrame[] = ["ICRS", "FK5", "GALACTIC"];
const spec = (f: ConvertibleFrame) => ({ radesys: f, equinox: f === "FK5" ? 2000 : null });
const wcsOf = (cards: Record<string, string | number>): Wcs => wcsFromHeader({ get: (k) => cards[k] });

/** Angular separation in degrees (Vincenty's formula: accurate at all separations; common practice, no source). */
function separationDeg(l1: number, b1: number, l2: number, b2: number): number {
  const dl = (l2 - l1) * D2R;
  const [s1, c1, s2, c2] = [Math.sin(b1 * D2R), Math.cos(b1 * D2R), Math.sin(b2 * D2R), Math.cos(b2 * D2R)];
  const num = Math.hypot(c2 * Math.sin(dl), c1 * s2 - s1 * c2 * Math.cos(dl));
  return Math.atan2(num, s1 * s2 + c1 * c2 * Math.cos(dl)) / D2R;
}

describe("frame rotations against astropy SkyCoord", () => {
  it("the reference values name the astropy version that made them", () => {
    expect(REF.library.astropy).toBe("5.2.1");
  });

  for (const from of FRAMES) {
    for (const to of FRAMES) {
      it(`${from} → ${to}: every reference point within 1e-9 deg of astropy's`, () => {
        const set = REF.points.find((p) => p.from === from)!;
        const m = frameRotation(spec(from), spec(to));
        const out = [0, 0];
        const sep = new Float64Array(set.lon_deg.length);
        for (let i = 0; i < sep.length; i++) {
          rotateLonLat(m, set.lon_deg[i]!, set.lat_deg[i]!, out);
          sep[i] = separationDeg(out[0]!, out[1]!, set[to].lon_deg[i]!, set[to].lat_deg[i]!);
          expect(out[0]).toBeGreaterThanOrEqual(0);
          expect(out[0]).toBeLessThan(360);
        }
        expect(sep).toAllClose(new Float64Array(sep.length), { rtol: 0, atol: 1e-9 });
      });
    }
  }

  it("icrsToGalacticDeg / galacticToIcrsDeg agree with astropy and invert each other to 1e-12 deg", () => {
    const icrs = REF.points.find((p) => p.from === "ICRS")!;
    const sep: number[] = [];
    const back: number[] = [];
    for (let i = 0; i < icrs.lon_deg.length; i++) {
      const g = icrsToGalacticDeg(icrs.lon_deg[i]!, icrs.lat_deg[i]!);
      sep.push(separationDeg(g.lDeg, g.bDeg, icrs.GALACTIC.lon_deg[i]!, icrs.GALACTIC.lat_deg[i]!));
      const r = galacticToIcrsDeg(g.lDeg, g.bDeg);
      back.push(separationDeg(r.raDeg, r.decDeg, icrs.lon_deg[i]!, icrs.lat_deg[i]!));
    }
    expect(sep).toAllClose(new Float64Array(sep.length), { rtol: 0, atol: 1e-9 });
    expect(back).toAllClose(new Float64Array(back.length), { rtol: 0, atol: 1e-12 });
  });

  it("the ICRS → FK5 frame bias is the ~23 mas rotation astropy applies, not the identity", () => {
    const icrs = REF.points.find((p) => p.from === "ICRS")!;
    const fk5 = icrs.FK5;
    const offMas = icrs.lon_deg.map((l, i) => separationDeg(l, icrs.lat_deg[i]!, fk5.lon_deg[i]!, fk5.lat_deg[i]!) * 3.6e6);
    expect(Math.max(...offMas)).toBeGreaterThan(15);
    expect(Math.max(...offMas)).toBeLessThan(35);
  });

  it("frames that need E-terms or precession are refused with BAD_WCS naming RADESYS", () => {
    for (const bad of [{ radesys: "FK4" as const, equinox: 1950 }, { radesys: "FK5" as const, equinox: 1975 }, { radesys: "GAPPT" as const, equinox: null }]) {
      try {
        frameRotation(bad, spec("GALACTIC"));
        expect.unreachable();
      } catch (e) {
        expect(isUmbraError(e, "BAD_WCS")).toBe(true);
        expect((e as { place: { keyword?: string } }).place.keyword).toBe("RADESYS");
      }
    }
    expect(frameRotation({ radesys: "FK4", equinox: 1950 }, { radesys: "FK4", equinox: 1950 })).toEqual([1, 0, 0, 0, 1, 0, 0, 0, 1]);
  });
});

describe("pixel mapping between grids in different frames, against astropy.wcs + SkyCoord", () => {
  for (const g of REF.grids) {
    it(`${g.name}: target pixel → source pixel within 1e-7 pixel, and back to the target pixel within 1e-8`, () => {
      const tw = wcsOf(g.target.header);
      const sw = wcsOf(g.source.header);
      const m = planPixelMapping(sw, tw);
      const inverse = planPixelMapping(tw, sw);
      const sx = new Float64Array(g.ix.length);
      const sy = new Float64Array(g.ix.length);
      const rx = new Float64Array(g.ix.length);
      const ry = new Float64Array(g.ix.length);
      const out = new Float64Array(2);
      for (let k = 0; k < g.ix.length; k++) {
        targetToSourcePixel(m, g.ix[k]!, g.iy[k]!, out);
        sx[k] = out[0]!;
        sy[k] = out[1]!;
        targetToSourcePixel(inverse, sx[k]!, sy[k]!, out);
        rx[k] = out[0]!;
        ry[k] = out[1]!;
      }
      expect(sx).toAllClose(g.source_ix, { rtol: 0, atol: 1e-7 });
      expect(sy).toAllClose(g.source_iy, { rtol: 0, atol: 1e-7 });
      expect(rx).toAllClose(g.ix, { rtol: 0, atol: 1e-8 });
      expect(ry).toAllClose(g.iy, { rtol: 0, atol: 1e-8 });
    });
  }
});

/** A map whose pixels hold a Gaussian of σ (deg) in angular distance from (lon0, lat0), in the map's own frame. */
function blobMap(nx: number, ny: number, wcs: Wcs, lon0: number, lat0: number, sigmaDeg: number): SkyMap {
  const ix = Float64Array.from({ length: nx * ny }, (_, k) => k % nx);
  const iy = Float64Array.from({ length: nx * ny }, (_, k) => Math.floor(k / nx));
  const { lonDeg, latDeg } = pixelToWorldArray(wcs, ix, iy);
  const data = Float64Array.from({ length: nx * ny }, (_, k) => Math.exp(-0.5 * (separationDeg(lonDeg[k]!, latDeg[k]!, lon0, lat0) / sigmaDeg) ** 2));
  return { data, nx, ny, wcs, unit: "K_CMB" };
}

describe("reprojection between Galactic and ICRS grids", () => {
  // blob centre (l, b) = (0.3°, −0.2°); astropy's ICRS position of it is the last galactic reference point
  const gal = REF.points.find((p) => p.from === "GALACTIC")!;
  const last = gal.lon_deg.length - 1;
  const centre = { l: gal.lon_deg[last]!, b: gal.lat_deg[last]!, ra: gal.ICRS.lon_deg[last]!, dec: gal.ICRS.lat_deg[last]! };
  const pix = 0.5 / 60;
  const sigma = 5 * pix; // 5 source pixels: Keys bicubic error ~3e-4 of the peak (docs/wcs.md)
  const galWcs = wcsOf({ CTYPE1: "GLON-CAR", CTYPE2: "GLAT-CAR", CRPIX1: 60.5, CRPIX2: 60.5, CRVAL1: 0.3, CRVAL2: -0.2, CD1_1: -pix, CD1_2: 0, CD2_1: 0, CD2_2: pix });
  const icrsWcs = wcsOf({
    CTYPE1: "RA---TAN",
    CTYPE2: "DEC--TAN",
    RADESYS: "ICRS",
    CRPIX1: 40.5,
    CRPIX2: 40.5,
    CRVAL1: centre.ra,
    CRVAL2: centre.dec,
    CD1_1: -0.45 / 60,
    CD1_2: 0,
    CD2_1: 0,
    CD2_2: 0.45 / 60,
  });

  it("in the right place: a galactic band's blob lands on astropy's ICRS position of its centre", () => {
    expect(centre.l).toBe(0.3);
    const source = blobMap(120, 120, galWcs, centre.l, centre.b, sigma);
    const out = reproject(source, { nx: 80, ny: 80, wcs: icrsWcs });
    const expected = blobMap(80, 80, icrsWcs, centre.ra, centre.dec, sigma);
    expect(out.unit).toBe("K_CMB");
    expect(out.wcs).toBe(icrsWcs);
    expect(out.data).toAllClose(expected.data, { rtol: 0, atol: 1e-3 });
    // the blob's peak pixel is the target's centre pixel (the ICRS grid is centred on astropy's position)
    let best = 0;
    for (let k = 1; k < out.data.length; k++) if (out.data[k]! > out.data[best]!) best = k;
    const w = pixelToWorld(icrsWcs, best % 80, Math.floor(best / 80));
    expect(separationDeg(w.lonDeg, w.latDeg, centre.ra, centre.dec)).toBeLessThan(0.45 / 60);
  });

  it("and back: ICRS → Galactic reprojection of the result restores the band inside the covered area", () => {
    const source = blobMap(120, 120, galWcs, centre.l, centre.b, sigma);
    const there = reproject(source, { nx: 80, ny: 80, wcs: icrsWcs });
    const back = reproject(there, { nx: 120, ny: 120, wcs: galWcs });
    const inner: number[] = [];
    const want: number[] = [];
    for (let iy = 40; iy < 80; iy++) {
      for (let ix = 40; ix < 80; ix++) {
        inner.push(back.data[iy * 120 + ix]!);
        want.push(source.data[iy * 120 + ix]!);
      }
    }
    expect(inner).toAllClose(want, { rtol: 0, atol: 2e-3 });
  });
});

describe("frame rotation properties", () => {
  it("rotations are orthonormal and compose: R(a→c) = R(b→c) · R(a→b) to 1e-15", () => {
    for (const a of FRAMES) {
      for (const b of FRAMES) {
        const rab = frameRotation(spec(a), spec(b));
        const rrt = multiply3(rab, transpose3(rab));
        expect([...rrt]).toAllClose([1, 0, 0, 0, 1, 0, 0, 0, 1], { rtol: 0, atol: 1e-15 });
        for (const c of FRAMES) {
          expect([...multiply3(frameRotation(spec(b), spec(c)), rab)]).toAllClose([...frameRotation(spec(a), spec(c))], { rtol: 0, atol: 1e-15 });
        }
      }
    }
  });

  it("any position taken ICRS → Galactic → ICRS returns within 1e-12 deg (fast-check, 500 positions)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 360, noNaN: true, maxExcluded: true }), fc.double({ min: -90, max: 90, noNaN: true }), (ra, dec) => {
        const g = icrsToGalacticDeg(ra, dec);
        const r = galacticToIcrsDeg(g.lDeg, g.bDeg);
        return separationDeg(r.raDeg, r.decDeg, ra, dec) < 1e-12 && g.bDeg >= -90 && g.bDeg <= 90 && g.lDeg >= 0 && g.lDeg < 360;
      }),
      { numRuns: 500, seed: 20261202 },
    );
  });
});
