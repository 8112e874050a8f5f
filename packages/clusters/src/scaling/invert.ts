/**
 * Y → M500: the mass whose predicted Y (from a scaling relation) equals the Y measured in the
 * aperture that mass implies. Because the measured Y depends on the assumed size θ500(M), this is
 * a coupled problem, solved in ln M by bracketing and bisection–secant iterations
 * (the idea behind the "M_YZ" mass proxy of the Planck SZ catalogue, Planck Collaboration 2014, A&A 571, A29; from memory).
 */
import { RAD_PER_ARCMIN, UmbraError, requireFinite, ARCMIN2_PER_SR } from "@umbra/core";
import { m500ToR500Mpc } from "../cosmology/overdensity.js";
import { requireRedshift } from "../cosmology/create.js";
import type { Cosmology } from "../cosmology/types.js";
import { gnfwA10 } from "../profiles/gnfw.js";
import { sphericalIntegral } from "../profiles/projection.js";
import type { PressureProfile } from "../profiles/types.js";
import type { YmRelation } from "./ym.js";

/** A measured Y in arcmin², fixed or as a function of the aperture θ500 (arcmin). */
export type YMeasurement = number | ((theta500Arcmin: number) => number);

/** Options of {@link m500FromY}. */
export interface MassFromYOptions {
  /** Measured Y (arcmin²) — a number, or a function of the assumed θ500 in arcmin. */
  yArcmin2: YMeasurement;
  /** Its 1σ error (arcmin²), same form. */
  yErrArcmin2: YMeasurement;
  z: number;
  cosmo: Cosmology;
  relation: YmRelation;
  /** What the measured Y is: "y500" = Y_sph(R500) or "y5r500" (default "y5r500"). */
  definition?: "y500" | "y5r500";
  /** Profile used to convert Y5R500 to Y500 (default A10 without mass term). */
  profile?: PressureProfile;
  /** Add the relation's intrinsic scatter to the mass error (default false). */
  includeScatter?: boolean;
  /** Mass search range in M☉ (default 1e12 … 1e17). */
  rangeMsun?: [number, number];
}

/** The result of {@link m500FromY}. */
export interface MassFromY {
  m500Msun: number;
  /** 1σ error on ln M500 (from Y's error, plus scatter if asked). */
  sigmaLnM: number;
  /** Symmetric error M·σ_lnM, M☉. */
  m500ErrMsun: number;
  /** Masses solving the problem at Y − σ and Y + σ (0 when Y − σ ≤ 0). */
  m500LowMsun: number;
  m500HighMsun: number;
  theta500Arcmin: number;
  r500Mpc: number;
  /** Y (arcmin²) at the solution, in the requested definition. */
  yArcmin2: number;
}

function evalY(y: YMeasurement, thetaArcmin: number): number {
  return typeof y === "number" ? y : y(thetaArcmin);
}

/**
 * Invert Y → M500 at redshift z. Predicted Y (arcmin²) = relation Y500 [Mpc²] / D_A² · (arcmin²/sr)
 * · (S(5)/S(1) of the profile when `definition` is "y5r500"). The error on ln M is
 * σ_lnM = √(σ_Y²/Y² + σ_scatter²) / |d ln Y_pred/d ln M − d ln Y_meas/d ln M|. Throws BAD_VALUE
 * for Y ≤ 0 and NUMERIC when no root lies in the search range.
 */
export function m500FromY(opts: MassFromYOptions): MassFromY {
  const z = requireFinite("z", requireRedshift(opts.z), (v) => v > 0, "not above 0");
  const cosmo = opts.cosmo;
  const def = opts.definition ?? "y5r500";
  const ratio = def === "y5r500" ? (() => {
    const prof = opts.profile ?? gnfwA10();
    return sphericalIntegral(prof, 5, 5) / sphericalIntegral(prof, 1, 5);
  })() : 1;
  const dA = cosmo.angularDiameterDistanceMpc(z);
  const [mLo, mHi] = opts.rangeMsun ?? [1e12, 1e17];
  const thetaOf = (m: number): number => m500ToR500Mpc(m, z, cosmo) / dA / RAD_PER_ARCMIN;
  const predicted = (m: number): number => ((opts.relation.y500Mpc2(m, z, cosmo) / (dA * dA)) * ARCMIN2_PER_SR) * ratio;

  const solve = (yMeas: YMeasurement): number => {
    const g = (lnM: number): number => {
      const m = Math.exp(lnM);
      const ym = evalY(yMeas, thetaOf(m));
      if (!(ym > 0)) throw new UmbraError("BAD_VALUE", `measured Y = ${ym} arcmin^2 is not positive`, { field: "yArcmin2", value: ym });
      return Math.log(predicted(m)) - Math.log(ym);
    };
    let a = Math.log(mLo);
    let b = Math.log(mHi);
    let ga = g(a);
    let gb = g(b);
    if (ga * gb > 0) {
      throw new UmbraError("NUMERIC", `no M500 in [${mLo}, ${mHi}] Msun reproduces the measured Y (ln ratio ${ga.toFixed(3)} … ${gb.toFixed(3)})`, { field: "yArcmin2" });
    }
    for (let it = 0; it < 200 && b - a > 1e-12; it++) {
      // secant step guarded by bisection (Illinois-free, simple and robust)
      let c = b - (gb * (b - a)) / (gb - ga);
      if (!(c > a && c < b) || it % 3 === 2) c = 0.5 * (a + b);
      const gc = g(c);
      if (gc === 0) return Math.exp(c);
      if (ga * gc < 0) {
        b = c;
        gb = gc;
      } else {
        a = c;
        ga = gc;
      }
    }
    return Math.exp(0.5 * (a + b));
  };

  const m = solve(opts.yArcmin2);
  const theta = thetaOf(m);
  const y = evalY(opts.yArcmin2, theta);
  const sy = requireFinite("yErrArcmin2", evalY(opts.yErrArcmin2, theta), (v) => v >= 0, "negative");
  const h = 1e-4;
  const slopePred = (Math.log(predicted(m * Math.exp(h))) - Math.log(predicted(m * Math.exp(-h)))) / (2 * h);
  const slopeMeas = (Math.log(evalY(opts.yArcmin2, thetaOf(m * Math.exp(h)))) - Math.log(evalY(opts.yArcmin2, thetaOf(m * Math.exp(-h))))) / (2 * h);
  const scatter = opts.includeScatter === true ? opts.relation.sigmaLnY : 0;
  const sigmaLnM = Math.sqrt((sy / y) ** 2 + scatter ** 2) / Math.abs(slopePred - slopeMeas);
  const shifted = (sign: number): YMeasurement =>
    typeof opts.yArcmin2 === "number"
      ? opts.yArcmin2 + sign * (typeof opts.yErrArcmin2 === "number" ? opts.yErrArcmin2 : opts.yErrArcmin2(theta))
      : (t: number) => evalY(opts.yArcmin2, t) + sign * evalY(opts.yErrArcmin2, t);
  const lowY = y - sy;
  const mLow = lowY > 0 && sy > 0 ? solve(shifted(-1)) : sy === 0 ? m : 0;
  const mHigh = sy > 0 ? solve(shifted(1)) : m;
  return {
    m500Msun: m,
    sigmaLnM,
    m500ErrMsun: m * sigmaLnM,
    m500LowMsun: mLow,
    m500HighMsun: mHigh,
    theta500Arcmin: theta,
    r500Mpc: m500ToR500Mpc(m, z, cosmo),
    yArcmin2: y,
  };
}
