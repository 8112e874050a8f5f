/**
 * Choosing the image HDU to read and checking that it holds one 2-D map: by index, by EXTNAME, or by
 * default the first HDU with image data (the primary array when it has pixels, else the first IMAGE
 * or tile-compressed extension) — common practice, no source.
 */
import { UmbraError } from "@umbra/core";
import type { HduLayout } from "./layout.js";

/** Which HDU to read: 0-based index or EXTNAME (case-insensitive). */
export type HduSelector = number | string;

function hasPixels(h: HduLayout): boolean {
  if (h.type === "COMPRESSED_IMAGE") return true;
  if (h.type !== "PRIMARY" && h.type !== "IMAGE") return false;
  return h.naxes.length > 0 && h.naxes.every((n) => n > 0) && h.header.get("GROUPS") !== true;
}

/** Pick the HDU named by `selector` (or the first image HDU); BAD_FITS when there is none or it is not an image. */
export function selectHdu(hdus: readonly HduLayout[], selector: HduSelector | undefined, file: string): HduLayout {
  let chosen: HduLayout | undefined;
  if (selector === undefined) {
    chosen = hdus.find(hasPixels);
    if (chosen === undefined) throw new UmbraError("BAD_FITS", `no HDU holds an image (${hdus.length} HDU(s) scanned)`, { file });
  } else if (typeof selector === "number") {
    chosen = hdus[selector];
    if (chosen === undefined || !Number.isInteger(selector)) {
      throw new UmbraError("BAD_FITS", `no HDU ${selector}: the file has HDUs 0..${hdus.length - 1}`, { file, hdu: selector });
    }
  } else {
    const want = selector.trim().toUpperCase();
    chosen = hdus.find((h) => h.extname !== null && h.extname.toUpperCase() === want);
    if (chosen === undefined) {
      const names = hdus.map((h) => h.extname).filter((n): n is string => n !== null);
      throw new UmbraError("BAD_FITS", `no HDU with EXTNAME '${selector}' (names present: ${names.length > 0 ? names.join(", ") : "none"})`, {
        file,
        hdu: selector,
        keyword: "EXTNAME",
      });
    }
  }
  if (chosen.type !== "PRIMARY" && chosen.type !== "IMAGE" && chosen.type !== "COMPRESSED_IMAGE") {
    throw new UmbraError("BAD_FITS", `HDU is a ${chosen.xtension} extension, not an image`, { file, hdu: chosen.index, keyword: "XTENSION" });
  }
  if (chosen.header.get("GROUPS") === true) {
    throw new UmbraError("BAD_FITS", "random-groups array, not an image", { file, hdu: chosen.index, keyword: "GROUPS" });
  }
  return chosen;
}

/**
 * The 2-D shape [nx, ny] of image axes `naxes` (NAXIS1..n or ZNAXIS1..n): axes beyond the second
 * must be degenerate (length 1), so a cube with NAXIS3 = 1 is one map. BAD_FITS otherwise.
 */
export function mapShape(naxes: readonly number[], file: string, hdu: number, prefix = "NAXIS"): [number, number] {
  if (naxes.length < 2) {
    throw new UmbraError("BAD_FITS", `${prefix} = ${naxes.length}: not a 2-D image`, { file, hdu, keyword: prefix });
  }
  for (let k = 2; k < naxes.length; k++) {
    if (naxes[k] !== 1) {
      throw new UmbraError("BAD_FITS", `${prefix}${k + 1} = ${String(naxes[k])}: a ${naxes.length}-D cube is not one 2-D map (extra axes must have length 1)`, {
        file,
        hdu,
        keyword: `${prefix}${k + 1}`,
      });
    }
  }
  const nx = naxes[0] as number;
  const ny = naxes[1] as number;
  if (nx < 1 || ny < 1) throw new UmbraError("BAD_FITS", `empty image (${nx} × ${ny} pixels)`, { file, hdu, keyword: `${prefix}1` });
  return [nx, ny];
}
