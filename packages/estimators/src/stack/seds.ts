/**
 * Band SEDs of the stack's bands in K_CMB per unit component amplitude (@umbra/spectra's
 * componentResponse: tSZ per unit y, relativistic when kTe > 0; kSZ per unit τv/c; CMB per K;
 * dust per MJy/sr at its reference frequency).
 */
import { componentResponse, type ComponentSpec } from "@umbra/spectra";
import type { SedProvider } from "../photometry/types.js";
import type { BandStack } from "./types.js";

/** Response of every band of `stack` to `component`, in K_CMB per unit amplitude. */
export function bandSed(stack: BandStack, component: ComponentSpec): Float64Array {
  return Float64Array.from(stack.bands.map((b) => componentResponse(component, b.spectral, "K_CMB")));
}

/** A {@link SedProvider} for `stack` (tSZ SEDs cached per kTe). */
export function stackSedProvider(stack: BandStack): SedProvider {
  const cache = new Map<number, Float64Array>();
  return {
    tsz(kTeKeV) {
      let s = cache.get(kTeKeV);
      if (s === undefined) {
        s = bandSed(stack, kTeKeV > 0 ? { kind: "tsz", kTeKeV } : { kind: "tsz" });
        cache.set(kTeKeV, s);
      }
      return s;
    },
    ksz: () => bandSed(stack, { kind: "ksz" }),
  };
}
