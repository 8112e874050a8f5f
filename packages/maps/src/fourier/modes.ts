/**
 * Per-mode quantities and operations on spectra in any plan's layout. Consumers never index a
 * spectrum by (kx, ky) arithmetic; they use these helpers or the layout's per-mode arrays.
 *
 * Flat-sky convention (umbra DESIGN, common practice, no single source): wavevector k in cycles
 * per radian, kx = kxIndex/(nx·dxRad), ky = kyIndex/(ny·dyRad); multipole ell = 2π|k|.
 */
import { UmbraError } from "@umbra/core";
import type { FlatGeometry } from "../types.js";
import type { SpectrumLayout } from "./types.js";

function checkGeometry(layout: SpectrumLayout, geom: FlatGeometry): void {
  if (layout.nx !== geom.nx || layout.ny !== geom.ny) {
    throw new UmbraError("BAD_VALUE", `geometry ${geom.nx}×${geom.ny} does not match the spectrum layout ${layout.nx}×${layout.ny}`, {
      field: "geom",
    });
  }
  if (!(geom.dxRad > 0) || !(geom.dyRad > 0) || !Number.isFinite(geom.dxRad) || !Number.isFinite(geom.dyRad)) {
    throw new UmbraError("BAD_VALUE", `pixel sizes must be finite and > 0 (dxRad = ${geom.dxRad}, dyRad = ${geom.dyRad})`, { field: "geom" });
  }
}

/** Wavevector components (kx, ky) of every stored mode, in cycles per radian: kx = kxIndex/(nx·dxRad), ky = kyIndex/(ny·dyRad). */
export function kxKyOfModes(layout: SpectrumLayout, geom: FlatGeometry): { kx: Float64Array; ky: Float64Array } {
  checkGeometry(layout, geom);
  const kx = new Float64Array(layout.modeCount);
  const ky = new Float64Array(layout.modeCount);
  const fx = 1 / (geom.nx * geom.dxRad);
  const fy = 1 / (geom.ny * geom.dyRad);
  for (let m = 0; m < layout.modeCount; m++) {
    kx[m] = (layout.kxIndex[m] as number) * fx;
    ky[m] = (layout.kyIndex[m] as number) * fy;
  }
  return { kx, ky };
}

/** Flat-sky multipole ell = 2π·sqrt(kx² + ky²) of every stored mode (k in cycles per radian, see {@link kxKyOfModes}). */
export function ellOfModes(layout: SpectrumLayout, geom: FlatGeometry): Float64Array {
  const { kx, ky } = kxKyOfModes(layout, geom);
  const ell = kx; // reuse
  for (let m = 0; m < layout.modeCount; m++) {
    const a = kx[m] as number;
    const b = ky[m] as number;
    ell[m] = 2 * Math.PI * Math.sqrt(a * a + b * b);
  }
  return ell;
}

/**
 * out_m = spectrum_m · weights_m for every complex mode m (a real transfer function per mode: a
 * beam, a filter). `spectrum` has 2·modeCount numbers (re, im), `weights` modeCount. `out` may be
 * `spectrum` itself (in place); a new array is returned when it is omitted.
 */
export function multiplyModes(spectrum: Float64Array, weights: Float64Array, out?: Float64Array): Float64Array {
  const nm = weights.length;
  if (spectrum.length !== 2 * nm) {
    throw new UmbraError("BAD_VALUE", `spectrum length ${spectrum.length} is not twice the weight count ${nm}`, { field: "weights" });
  }
  const o = out ?? new Float64Array(spectrum.length);
  if (o.length !== spectrum.length) throw new UmbraError("BAD_VALUE", `output length ${o.length} differs from spectrum length ${spectrum.length}`, { field: "out" });
  for (let m = 0; m < nm; m++) {
    const w = weights[m] as number;
    o[2 * m] = (spectrum[2 * m] as number) * w;
    o[2 * m + 1] = (spectrum[2 * m + 1] as number) * w;
  }
  return o;
}

/**
 * out_m = a_m · b_m (complex product per mode; with `conjugateB`, a_m · conj(b_m), as in a
 * cross-correlation). All arrays interleaved (re, im) of equal length; `out` may alias `a` or `b`.
 */
export function multiplyModesComplex(a: Float64Array, b: Float64Array, out?: Float64Array, conjugateB = false): Float64Array {
  if (a.length !== b.length || a.length % 2 !== 0) {
    throw new UmbraError("BAD_VALUE", `spectra lengths ${a.length} and ${b.length} differ or are odd`, { field: "b" });
  }
  const o = out ?? new Float64Array(a.length);
  if (o.length !== a.length) throw new UmbraError("BAD_VALUE", `output length ${o.length} differs from spectrum length ${a.length}`, { field: "out" });
  const s = conjugateB ? -1 : 1;
  for (let i = 0; i < a.length; i += 2) {
    const ar = a[i] as number;
    const ai = a[i + 1] as number;
    const br = b[i] as number;
    const bi = s * (b[i + 1] as number);
    o[i] = ar * br - ai * bi;
    o[i + 1] = ar * bi + ai * br;
  }
  return o;
}
