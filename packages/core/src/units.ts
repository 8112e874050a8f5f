/**
 * Names of the map units umbra understands, and angle conversions. The numbers that convert
 * between map units depend on frequency and bandpass and live in `@umbra/spectra`.
 */

/** Map units: CMB thermodynamic temperature (K or µK), Rayleigh–Jeans temperature, surface brightness, flux per beam. */
export type MapUnit = "K_CMB" | "uK_CMB" | "K_RJ" | "MJy/sr" | "Jy/beam";

/** Every accepted {@link MapUnit}, in a fixed order. */
export const MAP_UNITS: readonly MapUnit[] = ["K_CMB", "uK_CMB", "K_RJ", "MJy/sr", "Jy/beam"];

/** True when `s` is a {@link MapUnit}. */
export function isMapUnit(s: string): s is MapUnit {
  return (MAP_UNITS as readonly string[]).includes(s);
}

/** Radians per degree. */
export const RAD_PER_DEG = Math.PI / 180;
/** Radians per arcminute. */
export const RAD_PER_ARCMIN = Math.PI / (180 * 60);
/** Square arcminutes per steradian. */
export const ARCMIN2_PER_SR = 1 / (RAD_PER_ARCMIN * RAD_PER_ARCMIN);

/** Arcminutes → radians. */
export const arcminToRad = (arcmin: number): number => arcmin * RAD_PER_ARCMIN;
/** Radians → arcminutes. */
export const radToArcmin = (rad: number): number => rad / RAD_PER_ARCMIN;
/** Degrees → radians. */
export const degToRad = (deg: number): number => deg * RAD_PER_DEG;
/** Radians → degrees. */
export const radToDeg = (rad: number): number => rad / RAD_PER_DEG;

/** FWHM of a Gaussian → its standard deviation σ (same unit): σ = FWHM / sqrt(8 ln 2). */
export const fwhmToSigma = (fwhm: number): number => fwhm / Math.sqrt(8 * Math.LN2);
