/** Adapting a loaded band stack (../stack) to the y-map builder's band list. */
import type { BandStack } from "../stack/types.js";
import type { IlcBand } from "./ymap.js";

/** The stack's bands as {@link IlcBand}s (maps shared, not copied; masks carried over). */
export function ilcBandsFromStack(stack: BandStack): IlcBand[] {
  return stack.bands.map((b) => ({
    name: b.name,
    map: b.data,
    band: b.spectral,
    beamTransfer: b.beam,
    fwhmArcmin: b.beamFwhmArcmin,
    mask: b.mask,
  }));
}
