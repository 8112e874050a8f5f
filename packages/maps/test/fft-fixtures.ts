/** The numpy reference spectra of fixtures/fourier and helpers to compare with them (test helper). */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import type { SpectrumLayout } from "../src/fourier/types.js";

/** One numpy case: input map, full and half spectra, inverse of the half spectrum. */
export interface Case {
  nx: number;
  ny: number;
  map: number[];
  spectrum: number[];
  halfSpectrum: number[];
  inverse: number[];
}

/** fixtures/fourier/rfft2_reference.json (made by fixtures/fourier/make_reference.py). */
export const ref = JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/fourier/rfft2_reference.json", import.meta.url)), "utf8")) as {
  library: string;
  cases: Case[];
};

/** numpy's rfft2 half spectrum (ny rows × (nx/2+1), interleaved) rearranged into `layout`'s mode order. */
export function toLayout(numpyHalf: ArrayLike<number>, layout: SpectrumLayout): Float64Array {
  const nh = Math.floor(layout.nx / 2) + 1;
  const out = new Float64Array(layout.spectrumLength);
  for (let m = 0; m < layout.modeCount; m++) {
    const row = ((layout.kyIndex[m] as number) + layout.ny) % layout.ny;
    const i = 2 * (row * nh + (layout.kxIndex[m] as number));
    out[2 * m] = numpyHalf[i] as number;
    out[2 * m + 1] = numpyHalf[i + 1] as number;
  }
  return out;
}

/** Largest |a_i|. */
export function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] as number));
  return m;
}
