/**
 * The single place where the FITS reader asks the WCS module for a coordinate system.
 */
import { wcsFromHeader as parseWcs } from "../wcs/header.js";
import type { Wcs } from "../wcs/types.js";
import type { FitsHeader } from "./header.js";

/**
 * The celestial WCS described by `header` (Greisen & Calabretta 2002), or null when the image has no
 * CTYPE1/CTYPE2 at all. A WCS that is present but broken raises BAD_WCS from the WCS parser.
 */
export function wcsFromHeader(header: FitsHeader, file: string): Wcs | null {
  if (!header.has("CTYPE1") && !header.has("CTYPE2")) return null;
  return parseWcs(header, file);
}
