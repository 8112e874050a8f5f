/**
 * Flat-sky angular power spectra from FFT spectra (normalisation of types.ts).
 *
 * For maps f_a, f_b of nx × ny pixels of solid angle ΔΩ = dxRad·dyRad, the flat-sky estimate of the
 * cross-power at mode k is P_ab(k) = ΔΩ/(nx·ny) · Re(F_a(k) conj F_b(k)) (sr): the discrete form of
 * ⟨ã(l) b̃*(l')⟩ = (2π)² δ(l − l') C_l with ã the continuous Fourier transform over a patch of
 * area A = nx·ny·ΔΩ (the usual flat-sky convention; common practice, no single source). White noise
 * of per-pixel variance σ² has C_l = σ²·ΔΩ. Apodised maps need the result divided by the window's
 * mean square (see `windowPowerFraction`).
 */
import { UmbraError } from "@umbra/core";
import type { FlatGeometry } from "../types.js";
import { ellOfModes } from "./modes.js";
import type { SpectrumLayout } from "./types.js";

/** Binned power: centres (mode-weighted mean ell), C_ell (sr × map unit²) and the number of full-plane modes per bin. */
export interface BinnedPower {
  ellCenters: Float64Array;
  cl: Float64Array;
  modeCounts: Float64Array;
}

function checkSpectra(specA: Float64Array, specB: Float64Array, layout: SpectrumLayout): void {
  if (specA.length !== layout.spectrumLength || specB.length !== layout.spectrumLength) {
    throw new UmbraError("BAD_VALUE", `spectra lengths ${specA.length}, ${specB.length} differ from the layout's ${layout.spectrumLength}`, {
      field: "spectrum",
    });
  }
}

/** Per-mode cross-power P_ab = ΔΩ/(nx·ny)·Re(F_a conj F_b) (sr × unit²) for every stored mode (see module comment). */
export function powerSpectrum2d(specA: Float64Array, specB: Float64Array, layout: SpectrumLayout, geom: FlatGeometry): Float64Array {
  checkSpectra(specA, specB, layout);
  const norm = (geom.dxRad * geom.dyRad) / (geom.nx * geom.ny);
  const out = new Float64Array(layout.modeCount);
  for (let m = 0; m < layout.modeCount; m++) {
    out[m] = norm * ((specA[2 * m] as number) * (specB[2 * m] as number) + (specA[2 * m + 1] as number) * (specB[2 * m + 1] as number));
  }
  return out;
}

/**
 * The flat-sky angular cross-power C_ell binned in ell: bin i holds the modes with
 * binEdgesEll[i] ≤ ell < binEdgesEll[i+1] (ell = 2π|k|, see `ellOfModes`), each counted with its
 * Hermitian weight so the average runs over the full Fourier plane:
 * C_i = Σ w_m P_ab(m) / Σ w_m with P_ab of {@link powerSpectrum2d}. `modeCounts` is Σ w_m; an
 * empty bin gives C = NaN and the bin midpoint as its centre. Pass the same spectrum twice for
 * the auto power.
 */
export function crossPowerBinned(
  specA: Float64Array,
  specB: Float64Array,
  layout: SpectrumLayout,
  geom: FlatGeometry,
  binEdgesEll: Float64Array,
): BinnedPower {
  checkSpectra(specA, specB, layout);
  const nb = binEdgesEll.length - 1;
  if (nb < 1) throw new UmbraError("BAD_VALUE", "binEdgesEll needs at least two edges", { field: "binEdgesEll" });
  for (let i = 0; i < nb; i++) {
    if (!((binEdgesEll[i + 1] as number) > (binEdgesEll[i] as number))) {
      throw new UmbraError("BAD_VALUE", `binEdgesEll must increase strictly (edge ${i + 1})`, { field: "binEdgesEll", value: binEdgesEll[i + 1] });
    }
  }
  const ell = ellOfModes(layout, geom);
  const norm = (geom.dxRad * geom.dyRad) / (geom.nx * geom.ny);
  const sum = new Float64Array(nb);
  const sumEll = new Float64Array(nb);
  const counts = new Float64Array(nb);
  const lo = binEdgesEll[0] as number;
  const hi = binEdgesEll[nb] as number;
  for (let m = 0; m < layout.modeCount; m++) {
    const l = ell[m] as number;
    if (l < lo || l >= hi) continue;
    // binary search for the bin
    let a = 0;
    let b = nb;
    while (b - a > 1) {
      const c = (a + b) >> 1;
      if (l >= (binEdgesEll[c] as number)) a = c;
      else b = c;
    }
    const w = layout.hermitianWeight[m] as number;
    sum[a] = (sum[a] as number) + w * ((specA[2 * m] as number) * (specB[2 * m] as number) + (specA[2 * m + 1] as number) * (specB[2 * m + 1] as number));
    sumEll[a] = (sumEll[a] as number) + w * l;
    counts[a] = (counts[a] as number) + w;
  }
  const cl = new Float64Array(nb);
  const ellCenters = new Float64Array(nb);
  for (let i = 0; i < nb; i++) {
    const n = counts[i] as number;
    cl[i] = n > 0 ? (norm * (sum[i] as number)) / n : NaN;
    ellCenters[i] = n > 0 ? (sumEll[i] as number) / n : 0.5 * ((binEdgesEll[i] as number) + (binEdgesEll[i + 1] as number));
  }
  return { ellCenters, cl, modeCounts: counts };
}
