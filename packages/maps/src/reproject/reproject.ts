/**
 * Reprojection of one map onto another map's pixel grid: for each target pixel, its sky position
 * (target WCS), rotated into the source's celestial frame when the frames differ (ICRS, FK5 J2000,
 * Galactic; ../wcs/frames.ts), then that position's pixel in the source (source WCS), then
 * interpolation there (Keys 1981 bicubic by default, or bilinear). This is interpolation, not flux-conserving
 * drizzling: it suits maps sampled well above the beam (several pixels per FWHM).
 */
import { UmbraError } from "@umbra/core";
import type { SkyMap } from "../types.js";
import { planWcs } from "../wcs/transform.js";
import type { Wcs } from "../wcs/types.js";
import { sampleBicubic, sampleBilinear } from "./interpolate.js";
import type { InterpolationMethod } from "./interpolate.js";
import { planPixelMapping, targetToSourcePixel } from "./mapping.js";

/** A target pixel grid. */
export interface TargetGrid {
  nx: number;
  ny: number;
  wcs: Wcs;
}

/** Options of {@link reproject}. */
export interface ReprojectOptions {
  /** Interpolation method; default "bicubic" (Keys 1981, a = −1/2). */
  method?: InterpolationMethod;
}

/**
 * Resample `source` onto `target`'s grid. Target pixels whose sky position falls outside the
 * source (beyond its outer pixel edges, or not projectable) are NaN; NaN source pixels with a
 * non-zero interpolation weight give NaN. The unit is kept. Source and target may be in different
 * frames among ICRS, FK5 (equinox 2000) and Galactic (e.g. a GLON/GLAT band onto an RA/DEC grid).
 * @throws UmbraError BAD_WCS when either map has no WCS or their frames cannot be converted
 *   (FK4, GAPPT, FK5 at another equinox); BAD_OPTION for an unknown method.
 */
export function reproject(source: SkyMap, target: TargetGrid, options: ReprojectOptions = {}): SkyMap {
  if (source.wcs === null) throw new UmbraError("BAD_WCS", "the source map has no celestial WCS", { keyword: "CTYPE1" });
  const method = options.method ?? "bicubic";
  if (method !== "bicubic" && method !== "bilinear") throw new UmbraError("BAD_OPTION", `unknown interpolation method '${String(method)}'`, { field: "method" });
  const tw = target.wcs;
  const mapping = planPixelMapping(source.wcs, tw);
  const sample = method === "bicubic" ? sampleBicubic : sampleBilinear;
  const { nx, ny } = target;
  const out = new Float64Array(nx * ny);
  const tmp = new Float64Array(2);
  const src = source.data;
  for (let iy = 0; iy < ny; iy++) {
    for (let ix = 0; ix < nx; ix++) {
      targetToSourcePixel(mapping, ix, iy, tmp);
      out[iy * nx + ix] = Number.isNaN(tmp[0] as number) ? NaN : sample(src, source.nx, source.ny, tmp[0] as number, tmp[1] as number);
    }
  }
  const result: SkyMap = { data: out, nx, ny, wcs: tw };
  if (source.unit !== undefined) result.unit = source.unit;
  return result;
}

/**
 * True when two maps share one pixel grid: same size, projection, axis order and frame, and
 * CRPIX, CRVAL, CD, PV and the resolved native pole (α_p, δ_p, φ_p; so a LATPOLE written as 90
 * and one written as the pole latitude it selects compare equal) within `tol` (relative, default
 * 1e-9; CD relative to its largest element).
 */
export function sameGrid(a: { nx: number; ny: number; wcs: Wcs | null }, b: { nx: number; ny: number; wcs: Wcs | null }, tol = 1e-9): boolean {
  if (a.nx !== b.nx || a.ny !== b.ny) return false;
  if (a.wcs === null || b.wcs === null) return a.wcs === b.wcs;
  const p = a.wcs;
  const q = b.wcs;
  if (p.projection !== q.projection || p.lonAxis !== q.lonAxis || p.radesys !== q.radesys || p.equinox !== q.equinox) return false;
  const close = (x: number, y: number): boolean => Math.abs(x - y) <= tol * Math.max(1, Math.abs(x), Math.abs(y));
  const angleClose = (x: number, y: number): boolean => Math.abs(Math.atan2(Math.sin(x - y), Math.cos(x - y))) <= tol;
  const scale = Math.max(...p.cd.map(Math.abs));
  const cdClose = p.cd.every((v, i) => Math.abs(v - (q.cd[i] as number)) <= tol * scale);
  const pvKeys = new Set([...Object.keys(p.pv), ...Object.keys(q.pv)]);
  const pvClose = [...pvKeys].every((k) => close(p.pv[k] ?? 0, q.pv[k] ?? 0));
  if (!(cdClose && pvClose && close(p.crpix[0], q.crpix[0]) && close(p.crpix[1], q.crpix[1]))) return false;
  if (!(angleClose(p.crval[0] * D2R, q.crval[0] * D2R) && close(p.crval[1], q.crval[1]))) return false;
  const rp = planWcs(p).rot;
  const rq = planWcs(q).rot;
  return angleClose(rp.alphaP, rq.alphaP) && angleClose(rp.deltaP, rq.deltaP) && angleClose(rp.phiP, rq.phiP);
}

const D2R = Math.PI / 180;
