/**
 * A band stack whose second band is on a Galactic grid: it is reprojected onto the first band's ICRS
 * grid (frame rotation included; the rotation itself is checked against astropy in
 * packages/maps/test) and the warning says so; a smooth blob lands where its ICRS position says.
 */
import { afterAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { galacticToIcrsDeg, icrsToGalacticDeg, pixelToWorld, worldToPixel, writeSkyMapFits, type Wcs } from "@umbra/maps";
import { loadBandStack } from "../src/stack/load.js";

const dir = mkdtempSync(join(tmpdir(), "umbra-frames-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function wcs(ctype: [string, string], crval: [number, number], radesys: Wcs["radesys"]): Wcs {
  return { ctype, projection: "TAN", lonAxis: 0, crpix: [32.5, 32.5], crval, cd: [-1 / 60, 0, 0, 1 / 60], lonpole: 180, latpole: crval[1], pv: {}, radesys, equinox: null };
}

describe("band stack across celestial frames", () => {
  it("reprojects a Galactic band onto the ICRS grid of the first band and says so", async () => {
    const n = 64;
    const icrs = wcs(["RA---TAN", "DEC--TAN"], [150, 2], "ICRS");
    const g = icrsToGalacticDeg(150, 2);
    const gal = wcs(["GLON-TAN", "GLAT-TAN"], [g.lDeg, g.bDeg], "GALACTIC");
    // a Gaussian blob (σ = 4 px) at an ICRS position 5′ off the centre, painted on the Galactic grid
    const target = { ra: 150 + 5 / 60, dec: 2 - 3 / 60 };
    const tg = icrsToGalacticDeg(target.ra, target.dec);
    const pg = worldToPixel(gal, tg.lDeg, tg.bDeg);
    const blob = Float64Array.from({ length: n * n }, (_, p) => 1e-4 * Math.exp(-(((p % n) - pg.ix) ** 2 + (Math.floor(p / n) - pg.iy) ** 2) / 32));
    await writeSkyMapFits(join(dir, "a.fits"), { data: new Float64Array(n * n), nx: n, ny: n, wcs: icrs });
    await writeSkyMapFits(join(dir, "b.fits"), { data: blob, nx: n, ny: n, wcs: gal });
    const manifest = join(dir, "bands.json");
    writeFileSync(manifest, JSON.stringify({ bands: [
      { name: "a090", map: "a.fits", frequency_ghz: 90, beam_fwhm_arcmin: 2, unit: "K_CMB" },
      { name: "b150", map: "b.fits", frequency_ghz: 150, beam_fwhm_arcmin: 1.5, unit: "K_CMB" },
    ] }));
    const stack = await loadBandStack(manifest);
    expect(stack.warnings.some((w) => w.includes("band 'b150'") && w.includes("GALACTIC → ICRS"))).toBe(true);
    const data = stack.bands[1]!.data;
    // the rotated Galactic grid does not cover the ICRS grid's corners: those pixels are NaN
    let best = -1;
    for (let p = 0; p < data.length; p++) if (best < 0 ? Number.isFinite(data[p] as number) : (data[p] as number) > (data[best] as number)) best = p;
    const peak = pixelToWorld(icrs, best % n, Math.floor(best / n));
    const want = worldToPixel(icrs, target.ra, target.dec);
    expect(Math.hypot((best % n) - want.ix, Math.floor(best / n) - want.iy)).toBeLessThan(0.75);
    // the inverse rotation brings the peak back to the Galactic position of the target (to a pixel)
    const back = icrsToGalacticDeg(peak.lonDeg, peak.latDeg);
    const round = galacticToIcrsDeg(back.lDeg, back.bDeg);
    expect([round.raDeg, round.decDeg]).toAllClose([peak.lonDeg, peak.latDeg], { rtol: 0, atol: 1e-9 });
  });
});
