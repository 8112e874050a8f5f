/**
 * The mixing matrix: the response of each band to each component, in one map unit.
 */
import type { MapUnit } from "@umbra/core";
import { componentResponse } from "./components.js";
import type { ResponseOptions } from "./components.js";
import type { BandSpec, ComponentSpec } from "./types.js";

/** A bands × components response matrix, row-major: `values[b * nComponents + c]`. */
export interface MixingMatrix {
  readonly nBands: number;
  readonly nComponents: number;
  readonly unit: MapUnit;
  readonly values: Float64Array;
}

/**
 * Mixing matrix A with A[b][c] = response of band b, in `unit`, to one unit of component c's
 * amplitude (see {@link componentResponse}; Jy/beam needs one beam solid angle for all bands, so
 * build it per band in that case).
 */
export function mixingMatrix(bands: readonly BandSpec[], components: readonly ComponentSpec[], unit: MapUnit, opts: ResponseOptions = {}): MixingMatrix {
  const nb = bands.length;
  const nc = components.length;
  const values = new Float64Array(nb * nc);
  for (let b = 0; b < nb; b++) {
    for (let c = 0; c < nc; c++) values[b * nc + c] = componentResponse(components[c] as ComponentSpec, bands[b] as BandSpec, unit, opts);
  }
  return { nBands: nb, nComponents: nc, unit, values };
}

/** The column of a mixing matrix for one component (length nBands), e.g. the tSZ mixing vector. */
export function mixingColumn(m: MixingMatrix, component: number): Float64Array {
  const out = new Float64Array(m.nBands);
  for (let b = 0; b < m.nBands; b++) out[b] = m.values[b * m.nComponents + component] as number;
  return out;
}
