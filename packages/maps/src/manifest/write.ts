/** Writing a band manifest back to JSON (paths relative to the new manifest's folder), atomically. */
import { dirname, relative, resolve, sep } from "node:path";
import type { BandManifest } from "./schema.js";
import { writeTextAtomic } from "./atomic.js";

/**
 * Write `manifest` to `path` as JSON in the manifest format (snake_case keys), with every file
 * path made relative to the folder of `path` (POSIX separators), atomically (temp file + rename).
 */
export async function writeBandManifest(path: string, manifest: BandManifest): Promise<void> {
  const dir = dirname(resolve(path));
  const rel = (p: string): string => relative(dir, p).split(sep).join("/");
  const bands = manifest.bands.map((b) => {
    const e: Record<string, string | number> = { name: b.name, map: rel(b.mapPath) };
    if (b.frequencyGHz !== null) e.frequency_ghz = b.frequencyGHz;
    if (b.bandpassPath !== null) e.bandpass = rel(b.bandpassPath);
    if (b.beamFwhmArcmin !== null) e.beam_fwhm_arcmin = b.beamFwhmArcmin;
    if (b.beamPath !== null) e.beam = rel(b.beamPath);
    e.unit = b.unit;
    if (b.ivarPath !== null) e.ivar = rel(b.ivarPath);
    if (b.maskPath !== null) e.mask = rel(b.maskPath);
    if (b.hdu !== null) e.hdu = b.hdu;
    return e;
  });
  const out = manifest.name === null ? { bands } : { name: manifest.name, bands };
  await writeTextAtomic(path, `${JSON.stringify(out, null, 2)}\n`);
}
