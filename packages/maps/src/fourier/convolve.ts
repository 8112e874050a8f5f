/** Convolution of a map with a transfer function given per Fourier mode (forward, multiply, inverse). */
import { UmbraError } from "@umbra/core";
import type { FlatGeometry } from "../types.js";
import { multiplyModes } from "./modes.js";
import { getRfft2Plan } from "./rfft2-f64.js";

/**
 * IFFT(FFT(map) · T): the map convolved (periodically) with the kernel whose transfer function is
 * `transferOnModes` (one real value per stored mode of the cached plan's layout, e.g. a beam
 * B(ell) evaluated on `ellOfModes`). Returns a new map; `map` is not modified. Non-finite pixels
 * are rejected (mask or fill them first).
 */
export function convolveMap(map: Float64Array, transferOnModes: Float64Array, geom: FlatGeometry): Float64Array {
  const plan = getRfft2Plan(geom.nx, geom.ny);
  if (transferOnModes.length !== plan.layout.modeCount) {
    throw new UmbraError("BAD_VALUE", `transfer has ${transferOnModes.length} modes, the ${geom.nx}×${geom.ny} layout has ${plan.layout.modeCount}`, {
      field: "transferOnModes",
    });
  }
  for (let i = 0; i < map.length; i++) {
    if (!Number.isFinite(map[i] as number)) throw new UmbraError("BAD_DATA", `map pixel ${i} is not finite; fill or mask it before convolving`, { field: "map", row: i });
  }
  const spec = new Float64Array(plan.layout.spectrumLength);
  plan.forward(map, spec);
  multiplyModes(spec, transferOnModes, spec);
  const out = new Float64Array(geom.nx * geom.ny);
  plan.inverse(spec, out);
  return out;
}
