/**
 * A Compton-y map from a stack of bands by the ILC family: standard (one domain, tSZ constraint
 * only), constrained (one domain, tSZ plus zero response to the CMB and/or a dust SED) and
 * scale-dependent (several smooth ell windows, with or without deprojection). Bands are brought to
 * a common Gaussian effective beam (default: the widest band's FWHM), so the y map is the true y
 * convolved with that beam. The covariance comes from the apodised maps; the weights are applied to
 * the unapodised maps, so the y map covers the whole field.
 *
 * Methods: Eriksen et al. 2004 (ApJ 612, 633) for the ILC, Remazeilles, Delabrouille & Cardoso 2011
 * (MNRAS 410, 2481) for the constrained ILC, Delabrouille et al. 2009 (A&A 493, 835) for scale
 * domains and the ILC bias. See docs/ilc.md.
 */
import { UmbraError } from "@umbra/core";
import {
  apodisationWindow,
  crossPowerBinned,
  ellOfModes,
  gaussianBeam,
  getRfft2Plan,
  windowPowerFraction,
  type BinnedPower,
  type FlatGeometry,
} from "@umbra/maps";
import { componentResponse, type BandSpec, type ComponentSpec } from "@umbra/spectra";
import { inpaintHarmonic } from "../sources/inpaint.js";
import { apodisationModeFactor } from "./bias.js";
import { combineWithWeights, harmonicIlc, type IlcDomainReport } from "./harmonic.js";
import { cosineEllWindows, type EllWindowSet } from "./windows.js";

/** One band as the y-map builder needs it. */
export interface IlcBand {
  name: string;
  /** Map in K_CMB, row-major nx·ny (NaN marks missing pixels). */
  map: Float64Array;
  /** Frequency or bandpass, for the component responses. */
  band: BandSpec;
  /** Beam transfer function B(ℓ) evaluated on an array of multipoles (normalised B(0) = 1). */
  beamTransfer: (ell: Float64Array) => Float64Array;
  /** Beam FWHM in arcmin (for a beam file: its equivalent Gaussian), used to choose the effective beam. */
  fwhmArcmin: number;
  /** 1 = use, 0 = masked (e.g. a bright point source; inpainted before the transform), or null/absent. */
  mask?: Uint8Array | null;
}

/** Which member of the ILC family. */
export type IlcKind = "standard" | "constrained" | "scale";
/** Components the constrained ILC can null. */
export type DeprojectKind = "cmb" | "dust";
/** All deprojectable components, in a fixed order. */
export const DEPROJECT_KINDS: readonly DeprojectKind[] = ["cmb", "dust"];

/** Dust SED parameters for deprojection (modified blackbody). */
export interface DustSed {
  beta: number;
  temperatureK: number;
  refFrequencyGHz: number;
}

/**
 * Default dust SED: β = 1.6, T = 19.6 K at 353 GHz, close to the Galactic thermal-dust fits of Planck
 * Collaboration 2014 (A&A 571, A11) (from memory; a nuisance SED, not a measurement).
 */
export const DEFAULT_DUST_SED: DustSed = { beta: 1.6, temperatureK: 19.6, refFrequencyGHz: 353 };

/** Options of {@link buildYMap}. */
export interface YMapOptions {
  /** Family member (default "scale"). */
  ilc?: IlcKind;
  /** Components to null (default: ["cmb"] for "constrained", none otherwise). */
  deproject?: readonly DeprojectKind[];
  dust?: DustSed;
  /** Window boundaries in ℓ for "scale" (default: 300·2ⁿ below the Nyquist multipole). */
  ellBoundaries?: readonly number[];
  /** Transition width as a fraction of each boundary (default 0.5). */
  transitionFraction?: number;
  /** Largest acceptable ILC bias fraction per window (default 0.01). */
  maxBiasFraction?: number;
  /** FWHM of the y map's Gaussian effective beam, arcmin (default: the widest band's). */
  effectiveFwhmArcmin?: number;
  /** Width of the cosine edge taper used for the covariance, pixels (default: 5 % of the smaller side, at least 4). */
  apodisationWidthPix?: number;
  /** Electron temperature for a relativistic tSZ target, keV (default: non-relativistic). */
  kTeKeV?: number;
  /**
   * Maps (K_CMB, one per band, same order and grid) from which the band covariance is estimated
   * instead of the band maps themselves, e.g. the bands with a first-pass fit of every catalogued
   * cluster subtracted: cluster signal in the covariance correlates by chance with the
   * contaminants and the ILC then cancels part of it (the ILC bias of Delabrouille et al. 2009,
   * much larger than (m − k)/N_p for bright clusters on a steep foreground spectrum).
   */
  covarianceMaps?: readonly Float64Array[];
  /** Width of the noise-power bins in ℓ (default: twice the fundamental multipole 2π/L of the longer side L). */
  powerBinWidthEll?: number;
}

/** A y map and everything needed to use and trust it. */
export interface YMapProduct {
  /** Compton-y (dimensionless), row-major nx·ny, convolved with the effective beam; NaN where any band is missing or masked. */
  y: Float64Array;
  geometry: FlatGeometry;
  ilc: IlcKind;
  deprojected: DeprojectKind[];
  /** Gaussian FWHM of the y map's beam, arcmin. */
  effectiveFwhmArcmin: number;
  /**
   * Power spectrum of the y map (sr), from the apodised maps with the window's power fraction divided
   * out. It holds the clusters' own power too: for errors in a field of bright clusters use
   * {@link yMapNoisePower} with the clusters masked.
   */
  noisePower: BinnedPower;
  windows: EllWindowSet;
  merges: number;
  domains: IlcDomainReport[];
  biasWithinLimit: boolean;
  maxBiasFraction: number;
  bands: string[];
  /** Constraint SEDs (K_CMB per unit amplitude, per band): target first. */
  constraints: { component: string; response: number[] }[];
  /** ℓ of every stored mode of the grid's FFT layout (for aperture errors). */
  ellPerMode: Float64Array;
  /** Bin edges (ℓ) of noisePower. */
  powerBinEdgesEll: Float64Array;
  apodisation: { widthPix: number; modeFactor: number; powerFraction: number };
}

/** The effective beam's transfer: @umbra/maps' Gaussian beam (B_ℓ = exp(−ℓ(ℓ+1)σ²/2), the maps package's multipole convention). */
function gaussianTransfer(fwhmArcmin: number, ell: Float64Array): Float64Array {
  return gaussianBeam(fwhmArcmin).transferOnEll(ell);
}

function defaultBoundaries(ellNyquist: number): number[] {
  const out: number[] = [];
  for (let l = 300; l < 0.8 * ellNyquist; l *= 2) out.push(l);
  return out;
}

/** Per band and mode, B_eff(ℓ)/B_band(ℓ); NaN where the effective beam is below 1e-8 or the ratio exceeds 1e4 (mode left out). */
function beamRatios(bands: readonly IlcBand[], ell: Float64Array, effFwhmArcmin: number): Float64Array[] {
  const bEff = gaussianTransfer(effFwhmArcmin, ell);
  return bands.map((b) => {
    const bt = b.beamTransfer(ell);
    return bEff.map((e, k) => {
      if (e < 1e-8) return NaN;
      const r = e / (bt[k] as number);
      return Number.isFinite(r) && r < 1e4 ? r : NaN;
    });
  });
}

/**
 * Apply a y map's ILC (its windows, per-window weights and beam equalisation) to other maps of the
 * same bands, e.g. noise-only simulations (the y-map noise from simulations) or one sky component
 * alone (its residual in the y map). Maps in K_CMB, same order and grid as the y map's bands;
 * missing and masked pixels are inpainted as in {@link buildYMap}.
 */
export function applyYMapWeights(product: YMapProduct, bands: readonly IlcBand[]): Float64Array {
  const geom = product.geometry;
  validate(bands, geom);
  if (bands.length !== product.bands.length) {
    throw new UmbraError("BAD_DATA", `the y map was built from ${product.bands.length} bands, got ${bands.length}`, { field: "bands" });
  }
  const plan = getRfft2Plan(geom.nx, geom.ny);
  const n = geom.nx * geom.ny;
  const buf = new Float64Array(n);
  const spectra = bands.map((b) => {
    fillCentred(b, buf, geom.nx, geom.ny);
    const s = new Float64Array(plan.layout.spectrumLength);
    plan.forward(buf, s);
    return s;
  });
  const ratio = beamRatios(bands, product.ellPerMode, product.effectiveFwhmArcmin);
  const weights = product.domains.map((d) => Float64Array.from(d.weights));
  const spec = combineWithWeights(spectra, plan.layout, product.ellPerMode, ratio, product.windows, weights);
  const out = new Float64Array(n);
  plan.inverse(spec, out);
  return out;
}

/**
 * buf = map − mean(valid pixels), with missing (NaN) and masked pixels harmonically inpainted
 * (../sources/inpaint.ts): holes would leak large-scale power into cluster scales. Returns the mask
 * of pixels that were missing or masked.
 */
function fillCentred(b: IlcBand, buf: Float64Array, nx: number, ny: number): Uint8Array {
  const n = buf.length;
  const invalid = new Uint8Array(n);
  let sum = 0;
  let count = 0;
  for (let p = 0; p < n; p++) {
    const v = b.map[p] as number;
    if (Number.isFinite(v) && (b.mask == null || b.mask[p] !== 0)) {
      sum += v;
      count++;
    } else invalid[p] = 1;
  }
  if (count === 0) throw new UmbraError("BAD_DATA", "band map has no valid pixel (all missing or masked)", { band: b.name });
  const mean = sum / count;
  for (let p = 0; p < n; p++) buf[p] = invalid[p] ? 0 : (b.map[p] as number) - mean;
  if (count < n) inpaintHarmonic(buf, invalid, nx, ny);
  return invalid;
}

function validate(bands: readonly IlcBand[], geom: FlatGeometry): void {
  if (bands.length < 2) throw new UmbraError("BAD_DATA", `an ILC needs at least 2 bands, got ${bands.length}`, { field: "bands" });
  const n = geom.nx * geom.ny;
  for (const b of bands) {
    if (b.map.length !== n) throw new UmbraError("BAD_DATA", `map has ${b.map.length} pixels, the grid ${geom.nx}×${geom.ny}`, { band: b.name });
    if (!(b.fwhmArcmin > 0)) throw new UmbraError("BAD_VALUE", `beam FWHM ${b.fwhmArcmin} arcmin must be > 0`, { band: b.name, field: "beam_fwhm_arcmin" });
  }
}

function constraintList(bands: readonly IlcBand[], deproject: readonly DeprojectKind[], dust: DustSed, kTeKeV: number | undefined): { component: string; response: Float64Array }[] {
  const comps: { component: string; spec: ComponentSpec }[] = [{ component: "tsz", spec: kTeKeV !== undefined ? { kind: "tsz", kTeKeV } : { kind: "tsz" } }];
  for (const d of deproject) {
    if (d === "cmb") comps.push({ component: "cmb", spec: { kind: "cmb" } });
    else comps.push({ component: "dust", spec: { kind: "dust", ...dust } });
  }
  return comps.map((c) => ({ component: c.component, response: Float64Array.from(bands, (b) => componentResponse(c.spec, b.band, "K_CMB")) }));
}

/**
 * Build the y map (see module doc). Pure apart from the FFT plan cache.
 * @throws UmbraError BAD_DATA (fewer than 2 bands, grid mismatch, all-NaN band, non-positive-definite covariance,
 * more constraints than bands), BAD_VALUE / BAD_OPTION for bad options.
 */
export function buildYMap(bands: readonly IlcBand[], geom: FlatGeometry, options: YMapOptions = {}): YMapProduct {
  validate(bands, geom);
  const ilc = options.ilc ?? "scale";
  const deproject = [...new Set(options.deproject ?? (ilc === "constrained" ? ["cmb"] : []))] as DeprojectKind[];
  if (ilc === "constrained" && deproject.length === 0) {
    throw new UmbraError("BAD_OPTION", "the constrained ILC needs at least one component to deproject (cmb, dust)", { field: "deproject" });
  }
  const plan = getRfft2Plan(geom.nx, geom.ny);
  const layout = plan.layout;
  const ell = ellOfModes(layout, geom);
  const n = geom.nx * geom.ny;
  const widthPix = options.apodisationWidthPix ?? Math.max(4, Math.round(0.05 * Math.min(geom.nx, geom.ny)));
  const window = apodisationWindow(geom.nx, geom.ny, widthPix, "cosine");
  const invalid = new Uint8Array(n);
  const synth: Float64Array[] = [];
  const covSpec: Float64Array[] = [];
  const buf = new Float64Array(n);
  if (options.covarianceMaps !== undefined && options.covarianceMaps.length !== bands.length) {
    throw new UmbraError("INTERNAL", `${options.covarianceMaps.length} covariance maps for ${bands.length} bands`);
  }
  for (const [i, b] of bands.entries()) {
    const bad = fillCentred(b, buf, geom.nx, geom.ny);
    for (let p = 0; p < n; p++) if (bad[p]) invalid[p] = 1;
    const s = new Float64Array(layout.spectrumLength);
    plan.forward(buf, s);
    synth.push(s);
    const covMap = options.covarianceMaps?.[i];
    if (covMap !== undefined) fillCentred({ ...b, map: covMap }, buf, geom.nx, geom.ny);
    for (let p = 0; p < n; p++) buf[p] = (buf[p] as number) * (window[p] as number);
    const c = new Float64Array(layout.spectrumLength);
    plan.forward(buf, c);
    covSpec.push(c);
  }
  const effFwhm = options.effectiveFwhmArcmin ?? Math.max(...bands.map((b) => b.fwhmArcmin));
  if (!(effFwhm > 0)) throw new UmbraError("BAD_VALUE", `effective FWHM ${effFwhm} arcmin must be > 0`, { field: "effective-fwhm" });
  const ratio = beamRatios(bands, ell, effFwhm);
  const constraints = constraintList(bands, deproject, options.dust ?? DEFAULT_DUST_SED, options.kTeKeV);
  const ellNyq = Math.PI / Math.max(geom.dxRad, geom.dyRad);
  const boundaries = ilc === "scale" ? (options.ellBoundaries ?? defaultBoundaries(ellNyq)) : [];
  const modeFactor = apodisationModeFactor(window);
  const res = harmonicIlc({
    layout,
    ellPerMode: ell,
    covarianceSpectra: covSpec,
    synthesisSpectra: synth,
    beamRatio: ratio,
    constraints: constraints.map((c) => c.response),
    windows: cosineEllWindows(boundaries, options.transitionFraction ?? 0.5),
    maxBiasFraction: options.maxBiasFraction ?? 0.01,
    modeFactor,
    bandNames: bands.map((b) => b.name),
  });
  const y = new Float64Array(n);
  plan.inverse(res.spectrum, y);
  for (let p = 0; p < n; p++) if (invalid[p]) y[p] = NaN;
  const ellFund = (2 * Math.PI) / Math.max(geom.nx * geom.dxRad, geom.ny * geom.dyRad);
  const binWidth = options.powerBinWidthEll ?? 2 * ellFund;
  const ellCorner = Math.PI * Math.hypot(1 / geom.dxRad, 1 / geom.dyRad);
  const nBins = Math.max(1, Math.ceil(ellCorner / binWidth));
  const edges = Float64Array.from({ length: nBins + 1 }, (_, i) => i * binWidth + 1e-9);
  const raw = crossPowerBinned(res.covarianceOutputSpectrum, res.covarianceOutputSpectrum, layout, geom, edges);
  const w2 = windowPowerFraction(window);
  const noisePower: BinnedPower = { ellCenters: raw.ellCenters, cl: raw.cl.map((v) => v / w2), modeCounts: raw.modeCounts };
  return {
    y,
    geometry: geom,
    ilc,
    deprojected: deproject,
    effectiveFwhmArcmin: effFwhm,
    noisePower,
    windows: res.windows,
    merges: res.merges,
    domains: res.domains,
    biasWithinLimit: res.biasWithinLimit,
    maxBiasFraction: res.maxBiasFraction,
    bands: bands.map((b) => b.name),
    constraints: constraints.map((c) => ({ component: c.component, response: Array.from(c.response) })),
    ellPerMode: ell,
    powerBinEdgesEll: edges,
    apodisation: { widthPix, modeFactor, powerFraction: w2 },
  };
}
