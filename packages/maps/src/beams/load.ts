/** Building a band's beam from a file or a FWHM. */
import { UmbraError, RAD_PER_ARCMIN } from "@umbra/core";
import { readFile } from "node:fs/promises";
import { gaussianBeam } from "./gaussian.js";
import { profileBeam } from "./profile.js";
import { transferBeam } from "./transfer.js";
import { parseNumericTable } from "./table.js";
import { readTransferFits } from "./fitsTable.js";
import type { Beam } from "./types.js";

/** What a beam file holds: a radial profile (θ in arcmin, value) or a transfer function (ℓ, B_ℓ). */
export type BeamFileKind = "profile" | "transfer";

/**
 * Load a beam file. FITS files (by their "SIMPLE" signature, gzipped or not) hold B_ℓ in a table
 * (see `readTransferFits`). Text files hold two numeric columns: `theta_arcmin value` for a
 * profile or `ell B_ell` for a transfer function; without `kind` the first comment line that
 * names the columns decides (a first word starting with "theta" → profile, "ell" or "l" →
 * transfer).
 * @throws UmbraError NOT_FOUND, BAD_DATA (kind undecidable, bad table), BAD_FITS.
 */
export async function loadBeamFile(path: string, kind?: BeamFileKind): Promise<Beam> {
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch {
    throw new UmbraError("NOT_FOUND", "beam file not found or unreadable", { file: path });
  }
  const isGzip = bytes[0] === 0x1f && bytes[1] === 0x8b;
  const isFits = isGzip || bytes.subarray(0, 6).toString("latin1") === "SIMPLE";
  if (isFits) {
    if (kind === "profile") throw new UmbraError("BAD_DATA", "a FITS beam file must hold B_ell, not a profile", { file: path });
    const { ell, bell } = await readTransferFits(path);
    return transferBeam(ell, bell, path);
  }
  const text = bytes.toString("utf8");
  const k = kind ?? guessKind(text, path);
  const [x, y] = parseNumericTable(text, 2, path) as [Float64Array, Float64Array];
  if (k === "transfer") return transferBeam(x, y, path);
  const theta = Float64Array.from(x, (t) => t * RAD_PER_ARCMIN);
  return profileBeam(theta, y, { source: path });
}

function guessKind(text: string, path: string): BeamFileKind {
  for (const line of text.split(/\r?\n/)) {
    const t = line.trim();
    if (t === "") continue;
    if (!t.startsWith("#")) break;
    const first = (t.slice(1).trim().split(/[\s,]+/)[0] ?? "").toLowerCase();
    if (first.startsWith("theta")) return "profile";
    if (first === "ell" || first === "l" || first === "multipole") return "transfer";
  }
  throw new UmbraError("BAD_DATA", "cannot tell a profile from a B_ell table: add a comment line '# theta_arcmin value' or '# ell B_ell', or pass the kind", { file: path });
}

/**
 * The beam of a band: from its beam file when it has one, else the Gaussian of its FWHM.
 * @throws UmbraError BAD_MANIFEST naming the band when it has neither.
 */
export async function beamForBand(band: { name: string; beamPath: string | null; beamFwhmArcmin: number | null }, kind?: BeamFileKind): Promise<Beam> {
  if (band.beamPath !== null) return loadBeamFile(band.beamPath, kind);
  if (band.beamFwhmArcmin !== null) return gaussianBeam(band.beamFwhmArcmin);
  throw new UmbraError("BAD_MANIFEST", "band has neither a beam file nor a beam FWHM", { band: band.name, field: "beam" });
}
