/**
 * Spherical projections between native spherical coordinates (φ, θ) and the projection plane
 * (x, y), both in degrees, following Calabretta & Greisen 2002 (A&A 395, 1077) §5:
 * zenithal projections (§5.1) write x = R_θ sin φ, y = −R_θ cos φ with the radial functions
 * TAN (eq. 54), SIN (eqs. 55 and 48 for the generalised "slant" form with PV2_1 = ξ, PV2_2 = η),
 * ARC (eq. 80), STG (eq. 61), ZEA (eq. 68); CAR (§5.2.3, eq. 84) is x = φ, y = θ.
 *
 * Both directions write into a caller-owned 2-element array so pixel loops never allocate, and
 * return false (with NaN written) for points outside the projection's domain.
 */
import type { Projection } from "./types.js";

const D2R = Math.PI / 180;
const R2D = 180 / Math.PI;

/** Native latitude θ0 of the fiducial point in degrees: 90 for zenithal projections, 0 for CAR (C&G 2002 table 13). */
export function fiducialThetaDeg(projection: Projection): number {
  return projection === "CAR" ? 0 : 90;
}

/** Projection parameters that change the formulas: ξ, η of the slant orthographic (SIN) projection. */
export interface ProjectionParams {
  projection: Projection;
  xi: number;
  eta: number;
}

/**
 * Native spherical (φ, θ) in degrees → projection-plane (x, y) in degrees (C&G 2002 §5).
 * Writes into `out[0]`, `out[1]`; returns false (and NaN) where the projection is undefined
 * (TAN: θ ≤ 0; SIN: behind the limb; STG: θ = −90).
 */
export function nativeToPlane(p: ProjectionParams, phiDeg: number, thetaDeg: number, out: Float64Array | number[]): boolean {
  const phi = phiDeg * D2R;
  const theta = thetaDeg * D2R;
  const sinPhi = Math.sin(phi);
  const cosPhi = Math.cos(phi);
  let r: number;
  switch (p.projection) {
    case "CAR":
      out[0] = phiDeg;
      out[1] = thetaDeg;
      return true;
    case "TAN": {
      const s = Math.sin(theta);
      if (!(s > 0)) return bad(out);
      r = (R2D * Math.cos(theta)) / s;
      break;
    }
    case "SIN": {
      const cosT = Math.cos(theta);
      // 1 − sin θ = 2 sin²((90° − θ)/2), exact near the pole
      const h = Math.sin((Math.PI / 2 - theta) / 2);
      const z = 2 * h * h;
      if (p.xi === 0 && p.eta === 0) {
        if (thetaDeg < 0) return bad(out);
        r = R2D * cosT;
        break;
      }
      // visibility limit of the slant projection (wcslib's bound, consistent with C&G eq. 48)
      const limit = -Math.atan(p.xi * sinPhi - p.eta * cosPhi);
      if (theta < limit) return bad(out);
      out[0] = R2D * (cosT * sinPhi + p.xi * z);
      out[1] = -R2D * (cosT * cosPhi - p.eta * z);
      return true;
    }
    case "ARC":
      r = 90 - thetaDeg;
      break;
    case "STG": {
      if (thetaDeg <= -90) return bad(out);
      r = 2 * R2D * Math.tan((Math.PI / 2 - theta) / 2);
      break;
    }
    case "ZEA":
      r = 2 * R2D * Math.sin((Math.PI / 2 - theta) / 2);
      break;
  }
  out[0] = r * sinPhi;
  out[1] = -r * cosPhi;
  return true;
}

/**
 * Projection-plane (x, y) in degrees → native spherical (φ, θ) in degrees (inverse of
 * {@link nativeToPlane}; C&G 2002 §5). φ = arg(−y, x) for zenithal projections (eq. 14).
 * Returns false (and NaN) outside the projection's boundary (SIN: beyond the limb; ZEA: R > 2·180/π;
 * ARC: R > 180; CAR: |y| > 90).
 */
export function planeToNative(p: ProjectionParams, xDeg: number, yDeg: number, out: Float64Array | number[]): boolean {
  const tol = 1e-13;
  if (p.projection === "CAR") {
    if (Math.abs(yDeg) > 90 + tol) return bad(out);
    out[0] = xDeg;
    out[1] = Math.max(-90, Math.min(90, yDeg));
    return true;
  }
  if (p.projection === "SIN") return sinPlaneToNative(p.xi, p.eta, xDeg * D2R, yDeg * D2R, out);
  const r = Math.hypot(xDeg, yDeg);
  const phiDeg = r === 0 ? 0 : Math.atan2(xDeg, -yDeg) * R2D;
  let thetaDeg: number;
  switch (p.projection) {
    case "TAN":
      thetaDeg = Math.atan2(R2D, r) * R2D;
      break;
    case "ARC":
      if (r > 180 + tol) return bad(out);
      thetaDeg = 90 - r;
      break;
    case "STG":
      thetaDeg = 90 - 2 * Math.atan(r / (2 * R2D)) * R2D;
      break;
    case "ZEA": {
      const s = r / (2 * R2D);
      if (s > 1 + tol) return bad(out);
      thetaDeg = 90 - 2 * Math.asin(Math.min(1, s)) * R2D;
      break;
    }
    default:
      return bad(out);
  }
  out[0] = phiDeg;
  out[1] = thetaDeg;
  return true;
}

/**
 * Inverse of the (slant) orthographic projection, C&G 2002 eqs. 49–51, rewritten for z = 1 − sin θ:
 * a z² − 2 (ξX + ηY + 1) z + (X² + Y²) = 0 with a = ξ² + η² + 1; the root nearer the pole
 * z = (X² + Y²) / (b + sqrt(b² − a (X² + Y²))), b = ξX + ηY + 1, avoids cancellation.
 */
function sinPlaneToNative(xi: number, eta: number, X: number, Y: number, out: Float64Array | number[]): boolean {
  const a = xi * xi + eta * eta + 1;
  const b = xi * X + eta * Y + 1;
  const r2 = X * X + Y * Y;
  const disc = b * b - a * r2;
  if (disc < -1e-13) return bad(out);
  const den = b + Math.sqrt(Math.max(0, disc));
  if (!(den > 0)) return bad(out);
  const z = r2 / den;
  if (z > 2 + 1e-13) return bad(out);
  // θ = 90° − 2 asin(sqrt(z / 2)) since 1 − sin θ = 2 sin²((90° − θ)/2)
  const thetaDeg = 90 - 2 * Math.asin(Math.min(1, Math.sqrt(z / 2))) * R2D;
  const u = X - xi * z;
  const v = Y - eta * z;
  out[0] = u === 0 && v === 0 ? 0 : Math.atan2(u, -v) * R2D;
  out[1] = thetaDeg;
  return true;
}

function bad(out: Float64Array | number[]): false {
  out[0] = NaN;
  out[1] = NaN;
  return false;
}
