import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { isUmbraError } from "@umbra/core";
import {
  pixelToWorld,
  pixelToWorldArray,
  wcsFromHeader,
  wcsToHeaderCards,
  worldToPixel,
  worldToPixelArray,
} from "../src/wcs/index.js";
import type { Wcs } from "../src/wcs/types.js";

interface RefCase {
  name: string;
  header: Record<string, string | number>;
  resolved: { lonpole: number; latpole: number; radesys: string | null; equinox: number | null };
  pixel_to_world: { ix: number[]; iy: number[]; lon_deg: number[]; lat_deg: number[] };
  world_to_pixel: { lon_deg: number[]; lat_deg: number[]; ix: number[]; iy: number[] };
}

// Reference values: astropy.wcs (wcslib) via fixtures/wcs/make_reference.py; the library versions are in the JSON.
const ref = JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/wcs/reference.json", import.meta.url)), "utf8")) as {
  library: Record<string, string>;
  cases: RefCase[];
};

const headerOf = (cards: Record<string, string | number | boolean>) => ({ get: (k: string) => cards[k] });

/** Longitude difference folded into [−180, 180). */
function lonDiff(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const d = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) d[i] = ((((a[i] as number) - (b[i] as number) + 540) % 360) + 360) % 360 - 180;
  return d;
}

describe("wcsFromHeader + pixel↔world against astropy.wcs", () => {
  it("the reference file names the astropy version that made it", () => {
    expect(ref.library.astropy).toMatch(/^\d+\.\d+/);
    expect(ref.cases.length).toBeGreaterThanOrEqual(15);
  });

  for (const c of ref.cases) {
    describe(c.name, () => {
      const wcs = wcsFromHeader(headerOf(c.header), `${c.name}.fits`);

      it("resolves LONPOLE, LATPOLE, RADESYS and EQUINOX as astropy does", () => {
        expect(wcs.lonpole).toAllClose(c.resolved.lonpole, { atol: 1e-12 });
        expect(wcs.latpole).toAllClose(c.resolved.latpole, { atol: 1e-10 });
        expect(wcs.radesys).toBe(c.resolved.radesys ?? "GALACTIC");
        expect(wcs.equinox).toBe(c.resolved.equinox);
      });

      it("maps pixels to world within 1e-10 deg", () => {
        const p = c.pixel_to_world;
        const { lonDeg, latDeg } = pixelToWorldArray(wcs, p.ix, p.iy);
        expect(latDeg).toAllClose(p.lat_deg, { atol: 1e-10, rtol: 0 });
        // longitude compared on the sky: Δlon·cos(lat)
        const dl = lonDiff(lonDeg, p.lon_deg).map((d, i) => d * Math.cos(((p.lat_deg[i] as number) * Math.PI) / 180));
        expect(dl).toAllClose(0, { atol: 1e-10, rtol: 0 });
        for (const l of lonDeg) expect(l >= 0 && l < 360).toBe(true);
      });

      it("maps world to pixels within 1e-10 deg (pixel offset times pixel size)", () => {
        const w = c.world_to_pixel;
        const { ix, iy } = worldToPixelArray(wcs, w.lon_deg, w.lat_deg);
        const pixDeg = Math.sqrt(Math.abs(wcs.cd[0] * wcs.cd[3] - wcs.cd[1] * wcs.cd[2]));
        expect(ix).toAllClose(w.ix, { atol: 1e-10 / pixDeg, rtol: 0 });
        expect(iy).toAllClose(w.iy, { atol: 1e-10 / pixDeg, rtol: 0 });
      });

      it("reads back its own header cards to the same transform", () => {
        const cards: Record<string, string | number> = {};
        for (const card of wcsToHeaderCards(wcs)) cards[card.keyword] = card.value;
        const again = wcsFromHeader(headerOf(cards));
        const p = c.pixel_to_world;
        const a = pixelToWorldArray(wcs, p.ix, p.iy);
        const b = pixelToWorldArray(again, p.ix, p.iy);
        expect(b.latDeg).toAllClose(a.latDeg, { atol: 1e-12, rtol: 0 });
        expect(lonDiff(b.lonDeg, a.lonDeg)).toAllClose(0, { atol: 1e-12, rtol: 0 });
      });
    });
  }
});

describe("pixel → world → pixel round trips (property tests; common practice, no source)", () => {
  const pick = (name: string): Wcs => {
    const c = ref.cases.find((x) => x.name === name);
    if (c === undefined) throw new Error(name);
    return wcsFromHeader(headerOf(c.header));
  };
  for (const name of ["tan_cd", "sin_slant_pv", "car_oblique", "zea_near_south_pole", "tan_swapped_axes", "stg_fk4", "arc"]) {
    it(`${name}: worldToPixel(pixelToWorld(p)) = p within 1e-9 pixel`, () => {
      const wcs = pick(name);
      fc.assert(
        fc.property(fc.double({ min: -20, max: 140, noNaN: true }), fc.double({ min: -20, max: 120, noNaN: true }), (x, y) => {
          const w = pixelToWorld(wcs, x, y);
          const p = worldToPixel(wcs, w.lonDeg, w.latDeg);
          expect([p.ix, p.iy]).toAllClose([x, y], { atol: 1e-9, rtol: 0 });
        }),
        { numRuns: 300 },
      );
    });
  }

  it("the reference pixel (index CRPIX − 1) maps to CRVAL", () => {
    const wcs = pick("tan_pc_cdelt");
    const w = pixelToWorld(wcs, wcs.crpix[0] - 1, wcs.crpix[1] - 1);
    expect([w.lonDeg, w.latDeg]).toAllClose(wcs.crval, { atol: 1e-12, rtol: 0 });
  });
});

describe("header styles and defaults (Greisen & Calabretta 2002 §2.1, §3.1; Calabretta & Greisen 2002 §2.4)", () => {
  const tan = { CTYPE1: "RA---TAN", CTYPE2: "DEC--TAN", CRPIX1: 10, CRPIX2: 10, CRVAL1: 20, CRVAL2: 30 };

  it("builds CD from CROTA2 as CDELT·rotation", () => {
    const w = wcsFromHeader(headerOf({ ...tan, CDELT1: -0.01, CDELT2: 0.02, CROTA2: 30 }));
    const c = Math.cos(Math.PI / 6);
    const s = Math.sin(Math.PI / 6);
    expect(w.cd).toAllClose([-0.01 * c, -0.02 * s, -0.01 * s, 0.02 * c], { atol: 1e-15 });
  });

  it("prefers CDi_j over PCi_j and CDELTi, and fills missing CD elements with 0", () => {
    const w = wcsFromHeader(headerOf({ ...tan, CD1_1: -0.01, CD2_2: 0.01, PC1_2: 0.5, CDELT1: 3 }));
    expect(w.cd).toEqual([-0.01, 0, 0, 0.01]);
  });

  it("defaults RADESYS to ICRS without EQUINOX and to FK5 with EQUINOX 2000", () => {
    expect(wcsFromHeader(headerOf({ ...tan, CDELT1: 1, CDELT2: 1 })).radesys).toBe("ICRS");
    const fk5 = wcsFromHeader(headerOf({ ...tan, EQUINOX: 2000 }));
    expect([fk5.radesys, fk5.equinox]).toEqual(["FK5", 2000]);
    const fk4 = wcsFromHeader(headerOf({ ...tan, RADESYS: "FK4" }));
    expect([fk4.radesys, fk4.equinox]).toEqual(["FK4", 1950]);
  });

  it("accepts numeric strings for numeric keywords", () => {
    const w = wcsFromHeader(headerOf({ ...tan, CRVAL1: "20.5", CDELT1: "-0.01", CDELT2: "0.01" }));
    expect(w.crval[0]).toBe(20.5);
  });
});

describe("bad headers give BAD_WCS naming the file and keyword", () => {
  const ok = { CTYPE1: "RA---TAN", CTYPE2: "DEC--TAN", CRPIX1: 1, CRPIX2: 1, CRVAL1: 0, CRVAL2: 0, CDELT1: -1, CDELT2: 1 };
  const cases: Array<[string, Record<string, string | number>, string]> = [
    ["non-celestial axis", { ...ok, CTYPE1: "FREQ" }, "CTYPE1"],
    ["missing CTYPE2", { ...ok, CTYPE2: undefined as unknown as string }, "CTYPE2"],
    ["unknown projection", { ...ok, CTYPE1: "RA---XYZ", CTYPE2: "DEC--XYZ" }, "CTYPE1"],
    ["SIP distortion", { ...ok, CTYPE1: "RA---TAN-SIP", CTYPE2: "DEC--TAN-SIP" }, "CTYPE1"],
    ["mixed frames", { ...ok, CTYPE2: "GLAT-TAN" }, "CTYPE2"],
    ["two longitudes", { ...ok, CTYPE2: "RA---TAN" }, "CTYPE2"],
    ["singular CD", { ...ok, CD1_1: 1, CD1_2: 2, CD2_1: 2, CD2_2: 4 }, "CD1_1"],
    ["non-numeric CRVAL1", { ...ok, CRVAL1: "abc" }, "CRVAL1"],
    ["latitude beyond the pole", { ...ok, CRVAL2: 95 }, "CRVAL2"],
    ["unknown RADESYS", { ...ok, RADESYS: "XYZ" }, "RADESYS"],
  ];
  for (const [what, cards, keyword] of cases) {
    it(what, () => {
      try {
        wcsFromHeader(headerOf(cards), "band_150.fits");
        expect.unreachable();
      } catch (e) {
        expect(isUmbraError(e, "BAD_WCS")).toBe(true);
        if (isUmbraError(e)) {
          expect(e.place).toMatchObject({ file: "band_150.fits", keyword });
          expect(e.message).toContain("band_150.fits");
        }
      }
    });
  }

  it("gives NaN for a sky position behind the tangent plane (TAN) and beyond the limb (SIN)", () => {
    const tan = wcsFromHeader(headerOf(ok));
    const p = worldToPixel(tan, 180, 0);
    expect([Number.isNaN(p.ix), Number.isNaN(p.iy)]).toEqual([true, true]);
    const sin = wcsFromHeader(headerOf({ ...ok, CTYPE1: "RA---SIN", CTYPE2: "DEC--SIN", CDELT1: -1, CDELT2: 1 }));
    const w = pixelToWorld(sin, 100, 100);
    expect(Number.isNaN(w.lonDeg)).toBe(true);
  });
});

describe("makeWcs", () => {
  it("centres the grid on the requested position and matches the equivalent CROTA2 header", async () => {
    const { makeWcs } = await import("../src/wcs/index.js");
    const w = makeWcs({ projection: "TAN", centerDeg: [150, 2], nx: 101, ny: 80, pixelArcmin: 0.5, rotationDeg: 20 });
    const c = pixelToWorld(w, 50, 39.5);
    expect([c.lonDeg, c.latDeg]).toAllClose([150, 2], { atol: 1e-12, rtol: 0 });
    const h = wcsFromHeader(headerOf({ CTYPE1: "RA---TAN", CTYPE2: "DEC--TAN", CRPIX1: 51, CRPIX2: 40.5, CRVAL1: 150, CRVAL2: 2, CDELT1: -0.5 / 60, CDELT2: 0.5 / 60, CROTA2: 20 }));
    expect(w.cd).toAllClose(h.cd, { rtol: 1e-15 });
    const g = makeWcs({ projection: "CAR", centerDeg: [120, 10], nx: 10, ny: 10, pixelArcmin: 1, frame: "GALACTIC" });
    expect([g.ctype[0], g.radesys, g.lonpole]).toEqual(["GLON-CAR", "GALACTIC", 0]);
    expect(() => makeWcs({ projection: "TAN", centerDeg: [0, 0], nx: 0, ny: 10, pixelArcmin: 1 })).toThrow(/must be positive/);
  });
});
