/**
 * Reading a celestial WCS from FITS header keywords (Greisen & Calabretta 2002, A&A 395, 1061,
 * "Paper I"; Calabretta & Greisen 2002, A&A 395, 1077, "Paper II").
 *
 * Linear part, in order of precedence (Paper I §2.1.2–2.1.3 and its appendix on CROTA):
 * 1. any CDi_j present → CD matrix (missing elements 0; CDELTi, PCi_j, CROTAi ignored);
 * 2. else any PCi_j present → CD = diag(CDELT) · PC (missing PC elements from the unit matrix);
 * 3. else CROTA2 (or CROTA1) → CD1_1 = CDELT1 cos ρ, CD1_2 = −CDELT2 sin ρ,
 *    CD2_1 = CDELT1 sin ρ, CD2_2 = CDELT2 cos ρ (Paper I eq. 189 / the AIPS convention);
 * 4. else CD = diag(CDELT1, CDELT2) (CDELTi default 1).
 */
import { UmbraError } from "@umbra/core";
import { fiducialThetaDeg } from "./projections.js";
import { defaultLonpoleDeg, nativePoleDeg } from "./sphere.js";
import type { Projection, RadeSys, Wcs } from "./types.js";

/** Anything with a keyword lookup (a parsed FITS header, a Map, a plain-object wrapper). */
export interface HeaderLike {
  get(keyword: string): string | number | boolean | null | undefined;
}

const PROJECTIONS: readonly Projection[] = ["TAN", "SIN", "CAR", "ZEA", "ARC", "STG"];
const FRAMES: readonly RadeSys[] = ["ICRS", "FK5", "FK4", "FK4-NO-E", "GAPPT"];

/**
 * Build the celestial {@link Wcs} of a 2-D image from its header (Greisen & Calabretta 2002;
 * Calabretta & Greisen 2002). Accepts CDi_j, CDELTi + PCi_j and legacy CROTA2 styles, RA/DEC or
 * GLON/GLAT axes in either order, projections TAN, SIN (with PV for the slant form), CAR, ZEA,
 * ARC, STG. LONPOLE defaults to φ0 (δ0 ≥ θ0) or φ0 + 180° (Paper II §2.4); LATPOLE defaults to 90°
 * and is stored resolved, as the latitude δ_p of the native pole (as wcslib reports it).
 * RADESYS defaults (Paper I §3.1): absent with no EQUINOX → ICRS; with EQUINOX < 1984 → FK4, else
 * FK5; EQUINOX (or legacy EPOCH) defaults to 1950 for FK4/FK4-NO-E, 2000 for FK5, none for ICRS.
 *
 * @param header keyword lookup; numbers may be numbers or numeric strings
 * @param file   file name used in error messages
 * @throws UmbraError BAD_WCS naming the file and keyword: missing or non-celestial CTYPE, unknown
 *   projection, mismatched axis pair, singular linear transform, non-numeric value, no valid pole.
 */
export function wcsFromHeader(header: HeaderLike, file?: string): Wcs {
  const where = (keyword: string): { file?: string; keyword: string } => (file === undefined ? { keyword } : { file, keyword });
  const fail = (keyword: string, message: string): never => {
    throw new UmbraError("BAD_WCS", message, where(keyword));
  };
  const num = (keyword: string): number | undefined => {
    const v = header.get(keyword);
    if (v === undefined || v === null) return undefined;
    const x = typeof v === "number" ? v : typeof v === "string" && v.trim() !== "" ? Number(v.trim()) : NaN;
    if (!Number.isFinite(x)) fail(keyword, `value ${JSON.stringify(v)} is not a finite number`);
    return x;
  };
  const str = (keyword: string): string | undefined => {
    const v = header.get(keyword);
    if (v === undefined || v === null) return undefined;
    if (typeof v !== "string") fail(keyword, `value ${JSON.stringify(v)} is not a string`);
    return (v as string).trim();
  };

  const ctype1 = str("CTYPE1") ?? fail("CTYPE1", "missing: the image has no celestial WCS");
  const ctype2 = str("CTYPE2") ?? fail("CTYPE2", "missing: the image has no celestial WCS");
  const a1 = parseCtype(ctype1 as string, "CTYPE1", fail);
  const a2 = parseCtype(ctype2 as string, "CTYPE2", fail);
  if (a1.kind === a2.kind) fail("CTYPE2", `both axes are ${a1.kind === "lon" ? "longitudes" : "latitudes"} (${ctype1} / ${ctype2})`);
  if (a1.frame !== a2.frame) fail("CTYPE2", `axes ${ctype1} and ${ctype2} are not a celestial pair`);
  if (a1.projection !== a2.projection) fail("CTYPE2", `projections differ (${a1.projection} / ${a2.projection})`);
  const lonAxis: 0 | 1 = a1.kind === "lon" ? 0 : 1;
  const projection = a1.projection;
  const lonIndex = lonAxis === 0 ? 1 : 2;

  const crpix: [number, number] = [num("CRPIX1") ?? 0, num("CRPIX2") ?? 0];
  const crval: [number, number] = [num("CRVAL1") ?? 0, num("CRVAL2") ?? 0];
  const cd = linearPart(num);
  const det = cd[0] * cd[3] - cd[1] * cd[2];
  const scale = Math.max(Math.abs(cd[0]), Math.abs(cd[1]), Math.abs(cd[2]), Math.abs(cd[3]));
  if (!(scale > 0) || Math.abs(det) <= 1e-14 * scale * scale) fail("CD1_1", "the linear transform (CD / PC·CDELT / CROTA) is singular");

  const pv: Record<string, number> = {};
  for (const i of [1, 2]) {
    for (let m = 0; m <= 4; m++) {
      const v = num(`PV${i}_${m}`);
      if (v !== undefined) pv[`${i}_${m}`] = v;
    }
  }
  // φ0, θ0 offsets (PVi_1, PVi_2 on the longitude axis) are not supported: reject rather than ignore
  const phi0 = 0;
  const theta0 = fiducialThetaDeg(projection);
  const pvPhi0 = pv[`${lonIndex}_1`];
  const pvTheta0 = pv[`${lonIndex}_2`];
  if ((pvPhi0 !== undefined && pvPhi0 !== phi0) || (pvTheta0 !== undefined && pvTheta0 !== theta0)) {
    fail(`PV${lonIndex}_1`, "a non-default fiducial point (PVi_1/PVi_2 on the longitude axis) is not supported");
  }
  // PVi_m on the latitude axis of TAN, ZEA, ARC, STG, CAR carry no meaning here (Paper II §5) and are ignored

  const lng0 = crval[lonAxis];
  const lat0 = crval[1 - lonAxis];
  if (Math.abs(lat0) > 90) fail(`CRVAL${2 - lonAxis}`, `reference latitude ${lat0} is outside [-90, 90]`);
  const lonpole = num("LONPOLE") ?? pv[`${lonIndex}_3`] ?? defaultLonpoleDeg(lat0, phi0, theta0);
  const latpoleIn = num("LATPOLE") ?? pv[`${lonIndex}_4`] ?? 90;
  const pole = nativePoleDeg(lng0, lat0, phi0, theta0, lonpole, latpoleIn, file);

  const { radesys, equinox } = a1.frame === "GAL" ? { radesys: "GALACTIC" as RadeSys, equinox: null } : frameOf(str, num, fail);

  return {
    ctype: [ctype1 as string, ctype2 as string],
    projection,
    lonAxis,
    crpix,
    crval,
    cd,
    lonpole,
    latpole: pole.deltaP,
    pv,
    radesys,
    equinox,
  };
}

interface AxisType {
  kind: "lon" | "lat";
  frame: "EQ" | "GAL";
  projection: Projection;
}

function parseCtype(ctype: string, keyword: string, fail: (k: string, m: string) => never): AxisType {
  if (/-(SIP|TPV|TNX|ZPX|TPD)$/i.test(ctype)) {
    return fail(keyword, `'${ctype}': distortion conventions (SIP, TPV, TNX, ZPX, TPD) are not supported`);
  }
  const m = /^([A-Z]{1,4})-*-([A-Z0-9]{3})$/.exec(ctype.toUpperCase());
  if (m === null || ctype.length !== 8) {
    return fail(keyword, `'${ctype}' is not a celestial axis (expected e.g. RA---TAN, DEC--TAN, GLON-CAR)`);
  }
  const [, name, code] = m as unknown as [string, string, string];
  const known: Record<string, { kind: "lon" | "lat"; frame: "EQ" | "GAL" }> = {
    RA: { kind: "lon", frame: "EQ" },
    DEC: { kind: "lat", frame: "EQ" },
    GLON: { kind: "lon", frame: "GAL" },
    GLAT: { kind: "lat", frame: "GAL" },
  };
  const axis = known[name];
  if (axis === undefined) return fail(keyword, `'${ctype}' is not a supported celestial axis (RA/DEC or GLON/GLAT)`);
  if (!(PROJECTIONS as readonly string[]).includes(code)) {
    return fail(keyword, `projection '${code}' is not supported (supported: ${PROJECTIONS.join(", ")})`);
  }
  return { ...axis, projection: code as Projection };
}

function linearPart(num: (k: string) => number | undefined): [number, number, number, number] {
  const names = ["1_1", "1_2", "2_1", "2_2"] as const;
  const cdVals = names.map((n) => num(`CD${n}`));
  if (cdVals.some((v) => v !== undefined)) {
    return cdVals.map((v) => v ?? 0) as [number, number, number, number];
  }
  const cdelt1 = num("CDELT1") ?? 1;
  const cdelt2 = num("CDELT2") ?? 1;
  const pcVals = names.map((n) => num(`PC${n}`));
  if (pcVals.some((v) => v !== undefined)) {
    const pc = pcVals.map((v, k) => v ?? (k === 0 || k === 3 ? 1 : 0));
    return [cdelt1 * (pc[0] as number), cdelt1 * (pc[1] as number), cdelt2 * (pc[2] as number), cdelt2 * (pc[3] as number)];
  }
  const rho = num("CROTA2") ?? num("CROTA1");
  if (rho !== undefined && rho !== 0) {
    const c = Math.cos((rho * Math.PI) / 180);
    const s = Math.sin((rho * Math.PI) / 180);
    return [cdelt1 * c, -cdelt2 * s, cdelt1 * s, cdelt2 * c];
  }
  return [cdelt1, 0, 0, cdelt2];
}

function frameOf(
  str: (k: string) => string | undefined,
  num: (k: string) => number | undefined,
  fail: (k: string, m: string) => never,
): { radesys: RadeSys; equinox: number | null } {
  const raw = str("RADESYS") ?? str("RADECSYS");
  let equinox = num("EQUINOX") ?? num("EPOCH") ?? null;
  let radesys: RadeSys;
  if (raw !== undefined) {
    const up = raw.toUpperCase();
    if (!(FRAMES as readonly string[]).includes(up)) return fail("RADESYS", `unknown reference frame '${raw}'`);
    radesys = up as RadeSys;
  } else if (equinox === null) {
    radesys = "ICRS";
  } else {
    radesys = equinox < 1984 ? "FK4" : "FK5";
  }
  if (equinox === null) {
    if (radesys === "FK4" || radesys === "FK4-NO-E") equinox = 1950;
    else if (radesys === "FK5") equinox = 2000;
  }
  return { radesys, equinox };
}
