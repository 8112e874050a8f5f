/** Building a simple WCS for a new map (simulations, target grids). */
import { UmbraError } from "@umbra/core";
import { wcsFromHeader } from "./header.js";
import type { Wcs } from "./types.js";

/** Options of {@link makeWcs}. */
export interface MakeWcsOptions {
  projection: "TAN" | "SIN" | "CAR" | "ZEA" | "ARC" | "STG";
  /** Sky position (longitude, latitude) in degrees of the grid centre. */
  centerDeg: readonly [number, number];
  nx: number;
  ny: number;
  /** Pixel side in arcmin (square pixels). */
  pixelArcmin: number;
  /** Rotation of the grid, degrees, counter-clockwise from north (the CROTA2 sense). Default 0. */
  rotationDeg?: number;
  /** "ICRS" (RA/DEC axes, default) or "GALACTIC" (GLON/GLAT axes). */
  frame?: "ICRS" | "GALACTIC";
}

/**
 * A WCS whose reference point is the grid centre, CRPIX = ((nx + 1)/2, (ny + 1)/2) (FITS 1-based),
 * longitude increasing to the left (CD1_1 < 0, the usual sky orientation), square pixels, built
 * through {@link wcsFromHeader} so LONPOLE/LATPOLE get their standard defaults (Calabretta &
 * Greisen 2002 §2.4) and `latpole` holds the resolved native-pole latitude.
 * @throws UmbraError BAD_VALUE for non-positive sizes; BAD_WCS for an impossible centre.
 */
export function makeWcs(o: MakeWcsOptions): Wcs {
  for (const [name, v] of [["nx", o.nx], ["ny", o.ny], ["pixelArcmin", o.pixelArcmin]] as const) {
    if (!(v > 0) || !Number.isFinite(v)) throw new UmbraError("BAD_VALUE", `${name} = ${v} must be positive`, { field: name, value: v });
  }
  const d = o.pixelArcmin / 60;
  const rho = ((o.rotationDeg ?? 0) * Math.PI) / 180;
  const [lon, lat] = o.frame === "GALACTIC" ? ["GLON", "GLAT"] : ["RA--", "DEC-"];
  const cards: Record<string, string | number> = {
    CTYPE1: `${lon}-${o.projection}`,
    CTYPE2: `${lat}-${o.projection}`,
    CRPIX1: (o.nx + 1) / 2,
    CRPIX2: (o.ny + 1) / 2,
    CRVAL1: o.centerDeg[0],
    CRVAL2: o.centerDeg[1],
    CD1_1: -d * Math.cos(rho),
    CD1_2: -d * Math.sin(rho),
    CD2_1: -d * Math.sin(rho),
    CD2_2: d * Math.cos(rho),
  };
  if (o.frame !== "GALACTIC") cards.RADESYS = "ICRS";
  return wcsFromHeader({ get: (k) => cards[k] });
}
