/**
 * The map types every package shares.
 *
 * Pixel convention: a map is `ny` rows of `nx` pixels, row-major, x (FITS axis 1, usually RA)
 * fastest: pixel (ix, iy) is `data[iy * nx + ix]`. Pixel indices are 0-based here; FITS CRPIX is
 * 1-based, and the WCS module converts at its boundary.
 */
import type { MapUnit } from "@umbra/core";
import type { Wcs } from "./wcs/types.js";

/** One 2-D image on the sky with its coordinate system and unit. */
export interface SkyMap {
  /** Pixel values, row-major, x fastest; NaN marks missing pixels. */
  data: Float64Array;
  /** Pixels along x (FITS NAXIS1). */
  nx: number;
  /** Pixels along y (FITS NAXIS2). */
  ny: number;
  /** Celestial coordinate system, or null for an image without one. */
  wcs: Wcs | null;
  /** Unit of `data`, when known. */
  unit?: MapUnit;
}

/** Flat-sky geometry of a map: what the Fourier tools need. */
export interface FlatGeometry {
  nx: number;
  ny: number;
  /** Pixel side along x in radians (on the sky, at the reference point). */
  dxRad: number;
  /** Pixel side along y in radians. */
  dyRad: number;
}
