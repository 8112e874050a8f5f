/**
 * The simulated field's pixel grid: a WCS (TAN or CAR) centred on the scenario's centre, and the
 * flat-sky geometry the Fourier tools use. Pixel (0, 0) is the first FITS pixel; the reference
 * pixel CRPIX = ((n + 1)/2) sits at the grid centre, RA increasing to the left (CD1_1 < 0,
 * the usual sky orientation; Greisen & Calabretta 2002, A&A 395, 1061, §2).
 */
import { RAD_PER_ARCMIN } from "@umbra/core";
import type { FlatGeometry, Wcs } from "@umbra/maps";
import type { Scenario } from "../scenario/schema.js";

/** The WCS of a scenario's field (ICRS, CD matrix in degrees per pixel). */
export function fieldWcs(field: Scenario["field"]): Wcs {
  const d = field.pixelArcmin / 60;
  const p = field.projection;
  return {
    ctype: [`RA---${p}`, `DEC--${p}`],
    projection: p,
    lonAxis: 0,
    crpix: [(field.nx + 1) / 2, (field.ny + 1) / 2],
    crval: [field.centerDeg[0], field.centerDeg[1]],
    cd: [-d, 0, 0, d],
    // LONPOLE 180 for zenithal TAN (θ0 = 90°), 0 for CAR with δ0 ≥ 0 (Calabretta & Greisen 2002, §2.4, eq. 8 default)
    lonpole: p === "TAN" ? 180 : field.centerDeg[1] >= 0 ? 0 : 180,
    latpole: p === "TAN" ? field.centerDeg[1] : 90,
    pv: {},
    radesys: "ICRS",
    equinox: null,
  };
}

/** Flat-sky geometry of the field: square pixels of pixelArcmin on a side. */
export function fieldGeometry(field: Scenario["field"]): FlatGeometry {
  const d = field.pixelArcmin * RAD_PER_ARCMIN;
  return { nx: field.nx, ny: field.ny, dxRad: d, dyRad: d };
}
