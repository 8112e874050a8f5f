/**
 * Writing a {@link Wcs} back as FITS header cards, and shifting its reference pixel (cutouts).
 * The card set is the CD-matrix style of Greisen & Calabretta 2002 (A&A 395, 1061) §2.1.2 plus
 * LONPOLE/LATPOLE (Calabretta & Greisen 2002 §2.4), RADESYS/EQUINOX (Paper I §3.1) and PVi_m.
 */
import type { Wcs } from "./types.js";

/** One header card: keyword, value, comment. */
export interface WcsCard {
  keyword: string;
  value: string | number;
  comment: string;
}

/**
 * The header cards that describe `wcs` (CTYPEi, CRPIXi, CRVALi, CDi_j, LONPOLE, LATPOLE,
 * RADESYS, EQUINOX, PVi_m). Reading them back with `wcsFromHeader` gives the same transform.
 */
export function wcsToHeaderCards(wcs: Wcs): WcsCard[] {
  const cards: WcsCard[] = [
    { keyword: "CTYPE1", value: wcs.ctype[0], comment: "axis 1 type and projection" },
    { keyword: "CTYPE2", value: wcs.ctype[1], comment: "axis 2 type and projection" },
    { keyword: "CRPIX1", value: wcs.crpix[0], comment: "reference pixel, axis 1 (1-based)" },
    { keyword: "CRPIX2", value: wcs.crpix[1], comment: "reference pixel, axis 2 (1-based)" },
    { keyword: "CRVAL1", value: wcs.crval[0], comment: "[deg] world coordinate at CRPIX, axis 1" },
    { keyword: "CRVAL2", value: wcs.crval[1], comment: "[deg] world coordinate at CRPIX, axis 2" },
    { keyword: "CD1_1", value: wcs.cd[0], comment: "[deg/pixel] linear transform" },
    { keyword: "CD1_2", value: wcs.cd[1], comment: "[deg/pixel] linear transform" },
    { keyword: "CD2_1", value: wcs.cd[2], comment: "[deg/pixel] linear transform" },
    { keyword: "CD2_2", value: wcs.cd[3], comment: "[deg/pixel] linear transform" },
    { keyword: "LONPOLE", value: wcs.lonpole, comment: "[deg] native longitude of celestial pole" },
    { keyword: "LATPOLE", value: wcs.latpole, comment: "[deg] celestial latitude of native pole" },
  ];
  if (wcs.radesys !== "GALACTIC") cards.push({ keyword: "RADESYS", value: wcs.radesys, comment: "reference frame" });
  if (wcs.equinox !== null) cards.push({ keyword: "EQUINOX", value: wcs.equinox, comment: "[yr] equinox of the frame" });
  for (const key of Object.keys(wcs.pv).sort()) {
    cards.push({ keyword: `PV${key}`, value: wcs.pv[key] as number, comment: "projection parameter" });
  }
  return cards;
}

/**
 * The WCS of a sub-image whose pixel index (0, 0) is pixel index (x0, y0) of the parent: same
 * projection and sky, CRPIX moved by (−x0, −y0).
 */
export function shiftWcs(wcs: Wcs, x0: number, y0: number): Wcs {
  return { ...wcs, ctype: [...wcs.ctype], crval: [...wcs.crval], cd: [...wcs.cd], pv: { ...wcs.pv }, crpix: [wcs.crpix[0] - x0, wcs.crpix[1] - y0] };
}
