/**
 * A band stack: every band of one analysis on one pixel grid, in K_CMB, with its beam, spectral
 * band (frequency or bandpass), optional inverse-variance map and mask.
 */
import type { FlatGeometry, Wcs } from "@umbra/maps";
import type { BandSpec as SpectralBand } from "@umbra/spectra";
import type { BeamTransfer } from "../mmf/bank.js";

/** One band of a {@link BandStack}. */
export interface StackBand {
  readonly name: string;
  /** Frequency or bandpass, as @umbra/spectra takes it. */
  readonly spectral: SpectralBand;
  /** Beam transfer function B(ℓ). */
  readonly beam: BeamTransfer;
  /** Beam FWHM in arcmin (nominal, or the FWHM of a Gaussian with the same solid angle). */
  readonly beamFwhmArcmin: number;
  /** Pixel values in K_CMB, row-major (x fastest); NaN where missing. */
  readonly data: Float64Array;
  /** Inverse-variance map (1/K_CMB²) or null. */
  readonly ivar: Float64Array | null;
  /** 1 = use, 0 = masked (e.g. a bright point source), or null for none. */
  readonly mask: Uint8Array | null;
}

/** An input file and its SHA-256 (for provenance). */
export interface InputFile {
  readonly path: string;
  readonly sha256: string;
}

/** Every band on one grid. */
export interface BandStack {
  readonly nx: number;
  readonly ny: number;
  readonly geometry: FlatGeometry;
  readonly wcs: Wcs | null;
  readonly bands: readonly StackBand[];
  /** Non-fatal problems met while loading (unknown manifest keys, reprojection, NaNs). */
  readonly warnings: readonly string[];
  readonly inputs: readonly InputFile[];
}
