/**
 * Prepare a band stack for filtering: union of missing/masked pixels, harmonic inpainting of them
 * (../sources/inpaint.ts), an edge taper, and the forward transform of every apodised band.
 */
import { UmbraError } from "@umbra/core";
import { apodisationWindow, ellOfModes, getRfft2Plan, windowPowerFraction, type Rfft2Plan } from "@umbra/maps";
import { inpaintHarmonic } from "../sources/inpaint.js";
import type { BandStack } from "../stack/types.js";

/** Options of {@link prepareStack}. */
export interface PrepareOptions {
  /** Width of the cosine edge taper in arcmin (default 8). */
  readonly apodisationArcmin?: number;
}

/** A stack ready for the filter. */
export interface PreparedStack {
  readonly stack: BandStack;
  readonly plan: Rfft2Plan;
  readonly ells: Float64Array;
  /** Edge taper (1 inside). */
  readonly window: Float64Array;
  /** Mean of window² (pseudo-power normalisation). */
  readonly windowMeanSquare: number;
  /** 1 where some band was missing (NaN) or masked before inpainting. */
  readonly inpainted: Uint8Array;
  /** Forward transforms of window × inpainted map, one per band (K_CMB). */
  readonly spectra: readonly Float64Array[];
  /** Taper width in pixels. */
  readonly taperPix: number;
}

/** Build the {@link PreparedStack} (see module doc). */
export function prepareStack(stack: BandStack, opts: PrepareOptions = {}): PreparedStack {
  const { nx, ny, geometry } = stack;
  const npix = nx * ny;
  const bad = new Uint8Array(npix);
  for (const b of stack.bands) {
    for (let p = 0; p < npix; p++) {
      if (!Number.isFinite(b.data[p] as number) || (b.mask !== null && b.mask[p] === 0)) bad[p] = 1;
    }
  }
  let nBad = 0;
  for (let p = 0; p < npix; p++) nBad += bad[p] as number;
  if (nBad === npix) throw new UmbraError("BAD_DATA", "no pixel has data in every band (all missing or masked)");
  const pixArcmin = (Math.sqrt(geometry.dxRad * geometry.dyRad) * 180 * 60) / Math.PI;
  const taperArcmin = opts.apodisationArcmin ?? 8;
  if (!(taperArcmin >= 0)) throw new UmbraError("BAD_OPTION", `apodisation width ${taperArcmin} arcmin must be ≥ 0`, { field: "apodisationArcmin" });
  const taperPix = Math.min(taperArcmin / pixArcmin, Math.min(nx, ny) / 4);
  const window = apodisationWindow(nx, ny, taperPix, "cosine");
  const plan = getRfft2Plan(nx, ny);
  const work = new Float64Array(npix);
  const spectra = stack.bands.map((b) => {
    work.set(b.data);
    if (nBad > 0) inpaintHarmonic(work, bad, nx, ny);
    for (let p = 0; p < npix; p++) work[p] = (work[p] as number) * (window[p] as number);
    const spec = new Float64Array(plan.layout.spectrumLength);
    plan.forward(work, spec);
    return spec;
  });
  return {
    stack,
    plan,
    ells: ellOfModes(plan.layout, geometry),
    window,
    windowMeanSquare: windowPowerFraction(window),
    inpainted: bad,
    spectra,
    taperPix,
  };
}
