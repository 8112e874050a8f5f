/**
 * The spherical rotation between native (φ, θ) and celestial (α, δ) coordinates, with a general
 * native pole (Calabretta & Greisen 2002, A&A 395, 1077, §2.3 eqs. 2 and 5, §2.4 eqs. 8–10).
 * Latitudes come from atan2(z, hypot(x, y)) rather than asin(z), which keeps full precision next
 * to the poles.
 */
import { UmbraError } from "@umbra/core";

const D2R = Math.PI / 180;
const R2D = 180 / Math.PI;

/** The rotation, with the trigonometry of the pole precomputed. Angles in radians. */
export interface SphereRotation {
  /** Celestial longitude α_p of the native pole (rad). */
  alphaP: number;
  /** Celestial latitude δ_p of the native pole (rad). */
  deltaP: number;
  /** Native longitude φ_p of the celestial pole, = LONPOLE (rad). */
  phiP: number;
  sinDeltaP: number;
  cosDeltaP: number;
}

/** Default LONPOLE (C&G 2002 §2.4): φ0 if δ0 ≥ θ0, else φ0 + 180°. Degrees. */
export function defaultLonpoleDeg(lat0Deg: number, phi0Deg: number, theta0Deg: number): number {
  return lat0Deg >= theta0Deg ? phi0Deg : phi0Deg + 180;
}

/**
 * Celestial coordinates (α_p, δ_p) of the native pole from the fiducial point (α0, δ0) at native
 * (φ0, θ0), LONPOLE φ_p and LATPOLE (C&G 2002 §2.4, eqs. 8–10; where two solutions for δ_p exist
 * the one closer to LATPOLE is taken). Degrees in and out. Throws BAD_WCS when no valid pole exists.
 */
export function nativePoleDeg(
  lng0: number,
  lat0: number,
  phi0: number,
  theta0: number,
  lonpole: number,
  latpole: number,
  file?: string,
): { alphaP: number; deltaP: number } {
  if (theta0 === 90) return { alphaP: lng0, deltaP: lat0 };
  const tol = 1e-10;
  const sinLat0 = Math.sin(lat0 * D2R);
  const cosLat0 = Math.cos(lat0 * D2R);
  const sinThe0 = Math.sin(theta0 * D2R);
  const cosThe0 = Math.cos(theta0 * D2R);
  let deltaP: number;
  let sinDphi: number;
  if (lonpole === phi0) {
    sinDphi = 0;
    deltaP = choosePoleLatitude(theta0, 90 - lat0, latpole, file);
  } else {
    const dphi = (lonpole - phi0) * D2R;
    sinDphi = Math.sin(dphi);
    const x = cosThe0 * Math.cos(dphi);
    const y = sinThe0;
    const z = Math.hypot(x, y);
    if (z === 0) {
      if (sinLat0 !== 0) throw poleError("no native pole satisfies CRVAL, LONPOLE", file);
      deltaP = latpole;
    } else {
      const c = sinLat0 / z;
      if (Math.abs(c) > 1 + tol) throw poleError("no native pole satisfies CRVAL and LONPOLE (|sin δ0 / z| > 1)", file);
      deltaP = choosePoleLatitude(Math.atan2(y, x) * R2D, Math.acos(Math.max(-1, Math.min(1, c))) * R2D, latpole, file);
    }
  }
  let alphaP: number;
  if (Math.abs(cosLat0) < tol) {
    alphaP = lng0; // celestial pole at the fiducial point
  } else if (Math.abs(deltaP - 90) < tol) {
    alphaP = lng0 + lonpole - phi0 - 180;
  } else if (Math.abs(deltaP + 90) < tol) {
    alphaP = lng0 - lonpole + phi0;
  } else {
    const x = (sinThe0 - Math.sin(deltaP * D2R) * sinLat0) / (Math.cos(deltaP * D2R) * cosLat0);
    const y = (sinDphi * cosThe0) / cosLat0;
    if (x === 0 && y === 0) throw poleError("the native pole's longitude is undefined", file);
    alphaP = lng0 - Math.atan2(y, x) * R2D;
  }
  return { alphaP, deltaP };
}

/** δ_p = u ± v folded into [−180, 180]; keep a solution within ±90°, the one closer to LATPOLE. */
function choosePoleLatitude(u: number, v: number, latpole: number, file?: string): number {
  const tol = 1e-10;
  const wrap = (a: number): number => (a > 180 ? a - 360 : a < -180 ? a + 360 : a);
  const p1 = wrap(u + v);
  const p2 = wrap(u - v);
  let lat: number;
  if (Math.abs(latpole - p1) < Math.abs(latpole - p2)) lat = Math.abs(p1) <= 90 + tol ? p1 : p2;
  else lat = Math.abs(p2) <= 90 + tol ? p2 : p1;
  if (Math.abs(lat) > 90 + tol) throw poleError("no valid latitude for the native pole", file);
  return Math.max(-90, Math.min(90, lat));
}

function poleError(message: string, file?: string): UmbraError {
  return new UmbraError("BAD_WCS", message, { ...(file === undefined ? {} : { file }), keyword: "LONPOLE" });
}

/** Precompute the rotation for a native pole at (α_p, δ_p) and LONPOLE φ_p, all in degrees. */
export function makeRotation(alphaPDeg: number, deltaPDeg: number, phiPDeg: number): SphereRotation {
  const deltaP = deltaPDeg * D2R;
  return {
    alphaP: alphaPDeg * D2R,
    deltaP,
    phiP: phiPDeg * D2R,
    sinDeltaP: Math.sin(deltaP),
    cosDeltaP: Math.cos(deltaP),
  };
}

/**
 * Native (φ, θ) → celestial (α, δ), degrees (C&G 2002 eq. 2). α is returned in [0, 360).
 * Writes `out[0] = α`, `out[1] = δ`.
 */
export function nativeToCelestial(rot: SphereRotation, phiDeg: number, thetaDeg: number, out: Float64Array | number[]): void {
  const theta = thetaDeg * D2R;
  const dphi = phiDeg * D2R - rot.phiP;
  const sinT = Math.sin(theta);
  const cosT = Math.cos(theta);
  const cosD = Math.cos(dphi);
  const x = sinT * rot.cosDeltaP - cosT * rot.sinDeltaP * cosD;
  const y = -cosT * Math.sin(dphi);
  const z = sinT * rot.sinDeltaP + cosT * rot.cosDeltaP * cosD;
  out[0] = wrap360((rot.alphaP + Math.atan2(y, x)) * R2D);
  out[1] = Math.atan2(z, Math.hypot(x, y)) * R2D;
}

/**
 * Celestial (α, δ) → native (φ, θ), degrees (C&G 2002 eq. 5). φ is returned in [−180, 180).
 * Writes `out[0] = φ`, `out[1] = θ`.
 */
export function celestialToNative(rot: SphereRotation, alphaDeg: number, deltaDeg: number, out: Float64Array | number[]): void {
  const delta = deltaDeg * D2R;
  const da = alphaDeg * D2R - rot.alphaP;
  const sinD = Math.sin(delta);
  const cosD = Math.cos(delta);
  const cosA = Math.cos(da);
  const x = sinD * rot.cosDeltaP - cosD * rot.sinDeltaP * cosA;
  const y = -cosD * Math.sin(da);
  const z = sinD * rot.sinDeltaP + cosD * rot.cosDeltaP * cosA;
  out[0] = wrap180((rot.phiP + Math.atan2(y, x)) * R2D);
  out[1] = Math.atan2(z, Math.hypot(x, y)) * R2D;
}

/** Angle in degrees wrapped into [0, 360). */
export function wrap360(a: number): number {
  const w = a % 360;
  return w < 0 ? (w + 360 === 360 ? 0 : w + 360) : w;
}

/** Angle in degrees wrapped into [−180, 180). */
export function wrap180(a: number): number {
  return wrap360(a + 180) - 180;
}
