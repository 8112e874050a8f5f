/**
 * A celestial World Coordinate System for a 2-D image (Greisen & Calabretta 2002, A&A 395, 1061;
 * Calabretta & Greisen 2002, A&A 395, 1077). Linear part always held as a CD matrix in degrees
 * per pixel, whichever header style (CDi_j, CDELTi + PCi_j, CROTA2) it came from.
 *
 * Pixel convention at the API: 0-based indices (ix, iy); the FITS pixel coordinate is index + 1.
 */

/** Projection codes umbra can evaluate (Calabretta & Greisen 2002 §5). */
export type Projection = "TAN" | "SIN" | "CAR" | "ZEA" | "ARC" | "STG";

/** Celestial reference frame as read from RADESYS (or implied by EQUINOX), or GALACTIC for GLON/GLAT axes. */
export type RadeSys = "ICRS" | "FK5" | "FK4" | "FK4-NO-E" | "GAPPT" | "GALACTIC";

/** A celestial WCS. Pixel coordinates in `crpix` are FITS 1-based. */
export interface Wcs {
  /** CTYPE1, CTYPE2 as written, e.g. ["RA---TAN", "DEC--TAN"]. */
  ctype: [string, string];
  projection: Projection;
  /** Which image axis carries longitude: 0 when CTYPE1 is the longitude, 1 when swapped. */
  lonAxis: 0 | 1;
  /** Reference pixel, FITS 1-based (CRPIX1, CRPIX2). */
  crpix: [number, number];
  /** Reference world coordinate in degrees (CRVAL1, CRVAL2), in image-axis order. */
  crval: [number, number];
  /** Linear transform in degrees per pixel, row-major [CD1_1, CD1_2, CD2_1, CD2_2]. */
  cd: [number, number, number, number];
  /** LONPOLE and LATPOLE in degrees (defaults per Calabretta & Greisen 2002 §2.4). */
  lonpole: number;
  latpole: number;
  /** Projection parameters PVi_m by key "i_m", when present. */
  pv: Record<string, number>;
  /** Reference frame (RADESYS), and EQUINOX in years or null. */
  radesys: RadeSys;
  equinox: number | null;
}
