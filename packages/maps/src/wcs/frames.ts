/**
 * Rotations between the celestial frames umbra converts: ICRS, FK5 at equinox J2000, and Galactic
 * coordinates. Every conversion is a fixed 3 × 3 rotation of unit vectors
 * (x, y, z) = (cos b cos l, cos b sin l, sin b).
 *
 * - FK5 (J2000) → Galactic: the IAU 1958 system (Blaauw, Gum, Pawsey & Westerhout 1960, MNRAS 121,
 *   123; north galactic pole at B1950 α = 192.25°, δ = 27.4°, galactic longitude of the celestial
 *   pole 123°) carried to FK5 J2000: M_G = R3(180° − l₀) · R2(90° − δ_G) · R3(α_G) with
 *   α_G = 192.8594812065348°, δ_G = 27.12825118085622°, l₀ = 122.9319185680026°. These J2000 values
 *   are the ones astropy 5.2.1 uses (read from its source; wcslib uses the same, from memory),
 *   derived there by transforming the B1950 pole to FK5; Liu, Zhu & Zhang 2011 (A&A 526, A16)
 *   discuss this FK5-based definition.
 * - ICRS → FK5 (J2000): the frame bias B = R1(−η₀) · R2(ξ₀) · R3(dα₀) with η₀ = −19.9 mas,
 *   ξ₀ = 9.1 mas, dα₀ = −22.9 mas (the FK5 pole and equinox offsets from the ICRS measured with
 *   Hipparcos, Mignard & Froeschlé 2000, A&A 354, 732 — citation from memory; the values and their
 *   order are astropy 5.2.1's, whose source cites USNO Circular 179).
 * - ICRS → Galactic = M_G · B. The Hipparcos catalogue instead defines galactic coordinates directly
 *   on the ICRS (ESA 1997, vol. 1, §1.5.3: pole α = 192.85948°, δ = 27.12825°, l_Ω = 32.93192°,
 *   from memory), which differs from this chain by tens of milliarcseconds (Liu et al. 2011); we
 *   follow astropy's chain so that our conversions agree with astropy to ~1e-12° (tested).
 *
 * R1, R2, R3 are the passive rotations about x, y, z (astropy's `rotation_matrix` convention):
 * R1(θ) = [[1,0,0],[0,c,s],[0,−s,c]], R2(θ) = [[c,0,−s],[0,1,0],[s,0,c]], R3(θ) = [[c,s,0],[−s,c,0],[0,0,1]].
 * Other frames (FK4, FK4-NO-E, GAPPT, FK5 at an equinox other than 2000) would need E-terms or
 * precession and are refused with BAD_WCS.
 */
import { UmbraError } from "@umbra/core";
import type { RadeSys, Wcs } from "./types.js";

/** A 3 × 3 rotation matrix, row-major. */
export type Matrix3 = readonly [number, number, number, number, number, number, number, number, number];

/** The frames {@link frameRotation} converts between. */
export type ConvertibleFrame = "ICRS" | "FK5" | "GALACTIC";

const D2R = Math.PI / 180;
const MAS = 1 / 3_600_000; // degrees per milliarcsecond

function r1(deg: number): Matrix3 {
  const c = Math.cos(deg * D2R);
  const s = Math.sin(deg * D2R);
  return [1, 0, 0, 0, c, s, 0, -s, c];
}

function r2(deg: number): Matrix3 {
  const c = Math.cos(deg * D2R);
  const s = Math.sin(deg * D2R);
  return [c, 0, -s, 0, 1, 0, s, 0, c];
}

function r3(deg: number): Matrix3 {
  const c = Math.cos(deg * D2R);
  const s = Math.sin(deg * D2R);
  return [c, s, 0, -s, c, 0, 0, 0, 1];
}

/** Matrix product a · b. */
export function multiply3(a: Matrix3, b: Matrix3): Matrix3 {
  const m: number[] = [];
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      m.push((a[3 * i] as number) * (b[j] as number) + (a[3 * i + 1] as number) * (b[3 + j] as number) + (a[3 * i + 2] as number) * (b[6 + j] as number));
    }
  }
  return m as unknown as Matrix3;
}

/** Transpose (the inverse of a rotation). */
export function transpose3(a: Matrix3): Matrix3 {
  return [a[0], a[3], a[6], a[1], a[4], a[7], a[2], a[5], a[8]];
}

/** North galactic pole and longitude of the north celestial pole in FK5 J2000, degrees (see the module comment). */
export const GALACTIC_POLE_FK5_J2000 = { alphaDeg: 192.8594812065348, deltaDeg: 27.12825118085622, l0Deg: 122.9319185680026 } as const;

/** ICRS → FK5 (J2000) frame bias (Mignard & Froeschlé 2000): B = R1(−η₀) R2(ξ₀) R3(dα₀). */
export const ICRS_TO_FK5_J2000: Matrix3 = multiply3(multiply3(r1(19.9 * MAS), r2(9.1 * MAS)), r3(-22.9 * MAS));

/** FK5 (J2000) → Galactic: R3(180° − l₀) R2(90° − δ_G) R3(α_G) (Blaauw et al. 1960 system at J2000). */
export const FK5_J2000_TO_GALACTIC: Matrix3 = multiply3(
  multiply3(r3(180 - GALACTIC_POLE_FK5_J2000.l0Deg), r2(90 - GALACTIC_POLE_FK5_J2000.deltaDeg)),
  r3(GALACTIC_POLE_FK5_J2000.alphaDeg),
);

/** ICRS → Galactic: FK5_J2000_TO_GALACTIC · ICRS_TO_FK5_J2000. */
export const ICRS_TO_GALACTIC: Matrix3 = multiply3(FK5_J2000_TO_GALACTIC, ICRS_TO_FK5_J2000);

const IDENTITY: Matrix3 = [1, 0, 0, 0, 1, 0, 0, 0, 1];

/** Rotation from each convertible frame to ICRS. */
const TO_ICRS: Record<ConvertibleFrame, Matrix3> = {
  ICRS: IDENTITY,
  FK5: transpose3(ICRS_TO_FK5_J2000),
  GALACTIC: transpose3(ICRS_TO_GALACTIC),
};

/** A frame as a WCS records it: RADESYS value and EQUINOX (years) or null. */
export interface FrameSpec {
  radesys: RadeSys;
  equinox: number | null;
}

/** The convertible frame of `f`, or null (FK4, GAPPT, FK5 at an equinox other than 2000). */
export function convertibleFrame(f: FrameSpec): ConvertibleFrame | null {
  if (f.radesys === "ICRS" || f.radesys === "GALACTIC") return f.radesys;
  if (f.radesys === "FK5" && (f.equinox === null || f.equinox === 2000)) return "FK5";
  return null;
}

/** Name of a frame for messages: "FK5/2000", "ICRS", … */
function frameName(f: FrameSpec): string {
  return f.equinox === null ? f.radesys : `${f.radesys}/${f.equinox}`;
}

/**
 * The rotation taking unit vectors in frame `from` to frame `to` (identity when the frames are the
 * same, including FK4 to the same FK4). Converts between ICRS, FK5 J2000 and Galactic (module
 * comment for the matrices and their sources).
 * @throws UmbraError BAD_WCS naming RADESYS when a conversion needs E-terms or precession.
 */
export function frameRotation(from: FrameSpec, to: FrameSpec): Matrix3 {
  if (from.radesys === to.radesys && from.equinox === to.equinox) return IDENTITY;
  const a = convertibleFrame(from);
  const b = convertibleFrame(to);
  if (a === null || b === null) {
    throw new UmbraError(
      "BAD_WCS",
      `no conversion from ${frameName(from)} to ${frameName(to)}: only ICRS, FK5 (equinox 2000) and Galactic are converted (FK4 and other equinoxes need E-terms or precession)`,
      { keyword: "RADESYS" },
    );
  }
  return multiply3(transpose3(TO_ICRS[b]), TO_ICRS[a]);
}

/**
 * Rotate the sky position (lonDeg, latDeg) by `m` (from {@link frameRotation}); writes
 * [lon in [0, 360), lat] in degrees into `out`. Latitude from atan2(z, hypot(x, y)), exact near the
 * poles. Allocates nothing.
 */
export function rotateLonLat(m: Matrix3, lonDeg: number, latDeg: number, out: Float64Array | number[]): void {
  const l = lonDeg * D2R;
  const b = latDeg * D2R;
  const cb = Math.cos(b);
  const x = cb * Math.cos(l);
  const y = cb * Math.sin(l);
  const z = Math.sin(b);
  const X = m[0] * x + m[1] * y + m[2] * z;
  const Y = m[3] * x + m[4] * y + m[5] * z;
  const Z = m[6] * x + m[7] * y + m[8] * z;
  let lon = Math.atan2(Y, X) / D2R;
  if (lon < 0) lon += 360;
  if (lon >= 360) lon -= 360;
  out[0] = lon;
  out[1] = Math.atan2(Z, Math.hypot(X, Y)) / D2R;
}

/** Galactic (l, b) in degrees of the ICRS position (raDeg, decDeg): astropy's `SkyCoord(...).galactic` chain. */
export function icrsToGalacticDeg(raDeg: number, decDeg: number): { lDeg: number; bDeg: number } {
  const o = [0, 0];
  rotateLonLat(ICRS_TO_GALACTIC, raDeg, decDeg, o);
  return { lDeg: o[0] as number, bDeg: o[1] as number };
}

/** ICRS (α, δ) in degrees of the galactic position (lDeg, bDeg); the inverse of {@link icrsToGalacticDeg}. */
export function galacticToIcrsDeg(lDeg: number, bDeg: number): { raDeg: number; decDeg: number } {
  const o = [0, 0];
  rotateLonLat(TO_ICRS.GALACTIC, lDeg, bDeg, o);
  return { raDeg: o[0] as number, decDeg: o[1] as number };
}

/** The frame of a WCS as {@link frameRotation} takes it. */
export function frameOf(wcs: Wcs): FrameSpec {
  return { radesys: wcs.radesys, equinox: wcs.equinox };
}
