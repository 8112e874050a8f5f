/**
 * Load a band stack from a band manifest: validate the manifest (every problem at once), read
 * each band's FITS image, reproject onto the first band's grid when the grids differ, convert
 * each band to K_CMB (@umbra/spectra's unit conversion for the band's frequency or bandpass; the
 * beam solid angle for Jy/beam), and attach beam, ivar and mask. Nothing is filtered here.
 */
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { UmbraError } from "@umbra/core";
import {
  beamForBand,
  flatGeometry,
  loadBandManifest,
  readFitsImage,
  readNumericTable,
  reproject,
  convertibleFrame,
  frameOf,
  sameGrid,
  type BandSpec as ManifestBand,
  type SkyMap,
} from "@umbra/maps";
import { unitConversionFactor, type BandSpec as SpectralBand } from "@umbra/spectra";
import type { BandStack, InputFile, StackBand } from "./types.js";

/** Options of {@link loadBandStack}. */
export interface LoadStackOptions {
  /** Reproject bands whose grid differs from the first band's (default true; false = BAD_DATA). */
  readonly reproject?: boolean;
}

async function sha256(path: string): Promise<string> {
  return createHash("sha256").update(await readFile(path)).digest("hex");
}

async function spectralBand(b: ManifestBand): Promise<SpectralBand> {
  if (b.bandpassPath !== null) {
    const [nu, w] = await readNumericTable(b.bandpassPath, 2);
    return { bandpass: { frequencyGHz: nu as Float64Array, weight: w as Float64Array, name: b.name } };
  }
  if (b.frequencyGHz === null) throw new UmbraError("BAD_MANIFEST", "neither frequency_ghz nor bandpass given", { band: b.name });
  return { frequencyGHz: b.frequencyGHz };
}

function onGrid(map: SkyMap, ref: SkyMap, name: string, what: string, allow: boolean, warnings: string[]): Float64Array {
  if (sameGrid(map, ref)) return map.data;
  if (!allow) throw new UmbraError("BAD_DATA", `${what} is not on the first band's pixel grid (reprojection disabled)`, { band: name });
  if (ref.wcs === null) throw new UmbraError("BAD_WCS", "the first band has no celestial WCS to reproject onto", { band: name });
  const from = map.wcs === null ? null : convertibleFrame(frameOf(map.wcs));
  const to = convertibleFrame(frameOf(ref.wcs));
  const frames = from !== null && to !== null && from !== to ? `, ${from} → ${to}` : "";
  warnings.push(`band '${name}': ${what} reprojected (bicubic${frames}) onto the first band's grid`);
  return reproject(map, { nx: ref.nx, ny: ref.ny, wcs: ref.wcs }).data;
}

/**
 * Read every band of the manifest at `manifestPath` into a {@link BandStack} in K_CMB.
 * @throws UmbraError NOT_FOUND / BAD_MANIFEST / BAD_FITS / BAD_WCS / BAD_DATA naming the band and file.
 */
export async function loadBandStack(manifestPath: string, opts: LoadStackOptions = {}): Promise<BandStack> {
  const { manifest, warnings: mw } = await loadBandManifest(manifestPath);
  const warnings = [...mw];
  const inputs: InputFile[] = [{ path: manifest.path, sha256: await sha256(manifest.path) }];
  const allow = opts.reproject ?? true;
  let ref: SkyMap | null = null;
  const bands: StackBand[] = [];
  for (const b of manifest.bands) {
    const img = await readFitsImage(b.mapPath, b.hdu === null ? {} : { hdu: b.hdu });
    inputs.push({ path: b.mapPath, sha256: await sha256(b.mapPath) });
    if (img.bunit !== null && img.map.unit !== undefined && img.map.unit !== b.unit) {
      warnings.push(`band '${b.name}': BUNIT '${img.bunit}' differs from the manifest unit '${b.unit}'; the manifest wins`);
    }
    if (ref === null) ref = img.map;
    const data = Float64Array.from(onGrid(img.map, ref, b.name, "map", allow, warnings));
    const beam = await beamForBand(b);
    if (b.beamPath !== null) inputs.push({ path: b.beamPath, sha256: await sha256(b.beamPath) });
    const spectral = await spectralBand(b);
    if (b.bandpassPath !== null) inputs.push({ path: b.bandpassPath, sha256: await sha256(b.bandpassPath) });
    const toK = unitConversionFactor(b.unit, "K_CMB", spectral, { beamSolidAngleSr: beam.solidAngleSr });
    let nNaN = 0;
    for (let p = 0; p < data.length; p++) {
      const v = data[p] as number;
      if (Number.isFinite(v)) data[p] = v * toK;
      else {
        data[p] = NaN;
        nNaN++;
      }
    }
    if (nNaN > 0) warnings.push(`band '${b.name}': ${nNaN} missing pixels (inpainted before filtering, flagged for clusters on them)`);
    let ivar: Float64Array | null = null;
    if (b.ivarPath !== null) {
      const iv = await readFitsImage(b.ivarPath);
      inputs.push({ path: b.ivarPath, sha256: await sha256(b.ivarPath) });
      // inverse variance scales as 1/unit²
      ivar = Float64Array.from(onGrid(iv.map, ref, b.name, "ivar map", allow, warnings), (v) => v / (toK * toK));
    }
    let mask: Uint8Array | null = null;
    if (b.maskPath !== null) {
      const mk = await readFitsImage(b.maskPath, { allowAllNaN: true });
      inputs.push({ path: b.maskPath, sha256: await sha256(b.maskPath) });
      const m = onGrid(mk.map, ref, b.name, "mask", allow, warnings);
      mask = Uint8Array.from(m, (v) => (Number.isFinite(v) && v > 0.5 ? 1 : 0));
    }
    const fwhm = beam.fwhmArcmin ?? Math.sqrt((beam.solidAngleSr * 8 * Math.LN2) / (2 * Math.PI)) * (180 * 60 / Math.PI);
    bands.push({
      name: b.name,
      spectral,
      beam: (ells) => beam.transferOnEll(ells),
      beamFwhmArcmin: fwhm,
      data,
      ivar,
      mask,
    });
  }
  const first = ref as SkyMap;
  return { nx: first.nx, ny: first.ny, geometry: flatGeometry(first), wcs: first.wcs, bands, warnings, inputs };
}
