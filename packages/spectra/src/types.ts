/**
 * The shared vocabulary of the package: bands (a delta function or a tabulated transmission) and
 * sky components with their parameters.
 */

/**
 * A tabulated band transmission τ(ν): the detector signal is ∫ τ(ν) I_ν dν (τ is per unit
 * frequency and multiplies specific intensity; between samples τ is linear). Frequencies strictly
 * increasing, in GHz; weights ≥ 0, any overall scale. `refFrequencyGHz` is the frequency at which
 * MJy/sr and Jy/beam values are quoted (ν⁻¹ reference spectrum); default: the transmission-weighted
 * mean frequency ∫τν dν / ∫τ dν. Treat a bandpass as immutable: its quadrature is cached per object.
 */
export interface Bandpass {
  readonly frequencyGHz: Float64Array;
  readonly weight: Float64Array;
  readonly refFrequencyGHz?: number;
  /** A name used in error messages (e.g. the band's name in the manifest). */
  readonly name?: string;
}

/** A band: a delta function at one frequency, or a tabulated bandpass. */
export type BandSpec = { readonly frequencyGHz: number } | { readonly bandpass: Bandpass };

/**
 * A sky component and its spectral parameters. Amplitudes: tSZ per unit Compton-y; kSZ per unit
 * τ·v_r/c (v_r > 0 receding); CMB per K_CMB; dust, CIB and radio per MJy/sr of intensity at
 * `refFrequencyGHz`.
 */
export type ComponentSpec =
  | { readonly kind: "tsz"; readonly kTeKeV?: number }
  | { readonly kind: "ksz" }
  | { readonly kind: "cmb" }
  | { readonly kind: "dust"; readonly beta: number; readonly temperatureK: number; readonly refFrequencyGHz: number }
  | {
      readonly kind: "cib";
      readonly beta: number;
      /** Rest-frame dust temperature [K]. */
      readonly temperatureK: number;
      /** Effective redshift of the emitting galaxies (default 0). */
      readonly redshift?: number;
      readonly refFrequencyGHz: number;
    }
  | { readonly kind: "radio"; readonly alpha: number; readonly refFrequencyGHz: number };

/** Names of the component kinds, in a fixed order. */
export const COMPONENT_KINDS = ["tsz", "ksz", "cmb", "dust", "cib", "radio"] as const;
/** One of {@link COMPONENT_KINDS}. */
export type ComponentKind = (typeof COMPONENT_KINDS)[number];

/** A spectrum: specific intensity in MJy/sr at a frequency in GHz. */
export type Spectrum = (frequencyGHz: number) => number;
