/**
 * The band manifest: a JSON file listing the bands of one analysis (map file, frequency or
 * bandpass, beam FWHM or beam file, unit, optional inverse-variance map, mask and HDU). The file
 * format is umbra's own; see docs/wcs.md for an example.
 */
import { z } from "zod";
import { MAP_UNITS } from "@umbra/core";
import type { MapUnit } from "@umbra/core";

/** Keys a band entry may carry. Others produce warnings. */
export const BAND_KEYS = ["name", "map", "frequency_ghz", "bandpass", "beam_fwhm_arcmin", "beam", "unit", "ivar", "mask", "hdu"] as const;
/** Band keys that hold file paths (relative to the manifest folder). */
export const PATH_KEYS = ["map", "bandpass", "beam", "ivar", "mask"] as const;
/** Keys the top level may carry. Others produce warnings. */
export const TOP_KEYS = ["bands", "name", "notes"] as const;

const path = z.string().trim().min(1, "must be a non-empty path");

/** Schema of one band entry as written in the file (snake_case keys). */
export const bandEntrySchema = z.looseObject({
  name: z.string().trim().min(1, "must be a non-empty string"),
  map: path,
  frequency_ghz: z.number().positive("must be a positive number of GHz").finite().optional(),
  bandpass: path.optional(),
  beam_fwhm_arcmin: z.number().positive("must be a positive number of arcmin").finite().optional(),
  beam: path.optional(),
  unit: z.enum(MAP_UNITS as unknown as [MapUnit, ...MapUnit[]], { error: `must be one of ${MAP_UNITS.join(", ")}` }),
  ivar: path.optional(),
  mask: path.optional(),
  hdu: z.union([z.number().int().nonnegative(), z.string().trim().min(1)], { error: "must be an HDU index (integer ≥ 0) or an EXTNAME" }).optional(),
});

/** Schema of the whole file. */
export const manifestFileSchema = z.looseObject({
  name: z.string().optional(),
  notes: z.unknown().optional(),
  bands: z.array(z.unknown()).min(1, "must list at least one band"),
});

/** One band as umbra uses it: typed fields, absolute paths. */
export interface BandSpec {
  name: string;
  /** Absolute path of the FITS map. */
  mapPath: string;
  /** Nominal frequency in GHz, or null when only a bandpass is given. */
  frequencyGHz: number | null;
  /** Absolute path of the bandpass file, or null. */
  bandpassPath: string | null;
  /** Gaussian beam FWHM in arcmin, or null when only a beam file is given. */
  beamFwhmArcmin: number | null;
  /** Absolute path of the beam file (profile or B_ell table), or null. */
  beamPath: string | null;
  unit: MapUnit;
  /** Absolute path of the inverse-variance map, or null. */
  ivarPath: string | null;
  /** Absolute path of the mask map, or null. */
  maskPath: string | null;
  /** HDU index or EXTNAME of the image in the map file, or null for the first image HDU. */
  hdu: number | string | null;
}

/** A validated band manifest. */
export interface BandManifest {
  /** Absolute path of the manifest file (paths inside it were relative to its folder). */
  path: string;
  name: string | null;
  bands: BandSpec[];
}
