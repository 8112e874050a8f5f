/**
 * Y → M500: the mass whose predicted Y (from a scaling relation) equals the Y measured in the
 * aperture that mass implies. Because the measured Y depends on the assumed size θ500(M), this is
 * a coupled problem, solved in ln M by bracketing and Brent's method
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
 * Root of f in [a, b] (f(a), f(b) of opposite signs given) to an absolute tolerance `tol` in x, by
 * Brent's method — inverse quadratic interpolation, secant and bisection steps, guaranteed to
 * converge (Brent 1973, Algorithms for Minimization without Derivatives, ch. 4, "zeroin"; the
 * loop follows the common published form of that algorithm, from memory). f is a generator so that
 * its evaluations can be served step by step.
 */
function* brentRoot<Y>(f: (x: number) => Generator<number, number, Y>, a0: number, b0: number, fa0: number, fb0: number, tol: number): Generator<number, number, Y> {
  let a = a0;
  let b = b0;
  let fa = fa0;
  let fb = fb0;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let it = 0; it < 200; it++) {
    if (fb * fc > 0) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol1 = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tol;
    const xm = 0.5 * (c - b);
    if (Math.abs(xm) <= tol1 || fb === 0) return b;
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * xm * s;
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * xm * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      p = Math.abs(p);
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = xm;
        e = d;
      }
    } else {
      d = xm;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : xm >= 0 ? tol1 : -tol1;
    fb = yield* f(b);
  }
  return b;
}

/** Y and its 1σ error in arcmin², measured in the aperture of the θ500 (arcmin) a solver asked for. */
export interface YAtTheta {
  yArcmin2: number;
  yErrArcmin2: number;
}

/** Options of {@link m500FromYSteps}: those of {@link m500FromY} without the measurement, which comes step by step. */
export type MassFromYStepOptions = Omit<MassFromYOptions, "yArcmin2" | "yErrArcmin2"> & {
  /** The measured Y does not depend on θ500 (then Y ± σ at the solution are used for the mass range). */
  yIsFixed?: boolean;
};

/**
 * {@link m500FromY} as a generator: it yields each θ500 (arcmin) at which it needs the measured Y
 * and its error, takes them back through `next({ yArcmin2, yErrArcmin2 })`, and returns the result.
 * A caller can so advance many clusters' solutions in step and measure each step's apertures in one
 * batch (e.g. on several threads); the sequence of apertures is that of {@link m500FromY}.
 */
export function* m500FromYSteps(opts: MassFromYStepOptions): Generator<number, MassFromY, YAtTheta> {
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
  type Measure = (thetaArcmin: number) => Generator<number, number, YAtTheta>;
  const yAt = function* (thetaArcmin: number): Generator<number, YAtTheta, YAtTheta> {
    return yield thetaArcmin;
  };
  const measured: Measure = function* (t) {
    return (yield* yAt(t)).yArcmin2;
  };

  const solve = function* (meas: Measure): Generator<number, number, YAtTheta> {
    const g = function* (lnM: number): Generator<number, number, YAtTheta> {
      const m = Math.exp(lnM);
      const ym = yield* meas(thetaOf(m));
      if (!(ym > 0)) throw new UmbraError("BAD_VALUE", `measured Y = ${ym} arcmin^2 is not positive`, { field: "yArcmin2", value: ym });
      return Math.log(predicted(m)) - Math.log(ym);
    };
    const a = Math.log(mLo);
    const b = Math.log(mHi);
    const ga = yield* g(a);
    const gb = yield* g(b);
    if (ga * gb > 0) {
      throw new UmbraError("NUMERIC", `no M500 in [${mLo}, ${mHi}] Msun reproduces the measured Y (ln ratio ${ga.toFixed(3)} … ${gb.toFixed(3)})`, { field: "yArcmin2" });
    }
    return Math.exp(yield* brentRoot(g, a, b, ga, gb, 1e-12));
  };

  const m = yield* solve(measured);
  const theta = thetaOf(m);
  const at = yield* yAt(theta);
  const y = at.yArcmin2;
  const sy = requireFinite("yErrArcmin2", at.yErrArcmin2, (v) => v >= 0, "negative");
  const h = 1e-4;
  const slopePred = (Math.log(predicted(m * Math.exp(h))) - Math.log(predicted(m * Math.exp(-h)))) / (2 * h);
  const yUp = yield* measured(thetaOf(m * Math.exp(h)));
  const yDown = yield* measured(thetaOf(m * Math.exp(-h)));
  const slopeMeas = (Math.log(yUp) - Math.log(yDown)) / (2 * h);
  const scatter = opts.includeScatter === true ? opts.relation.sigmaLnY : 0;
  const sigmaLnM = Math.sqrt((sy / y) ** 2 + scatter ** 2) / Math.abs(slopePred - slopeMeas);
  const shifted = (sign: number): Measure =>
    opts.yIsFixed === true
      ? function* () {
          return y + sign * sy;
        }
      : function* (t) {
          const r = yield* yAt(t);
          return r.yArcmin2 + sign * r.yErrArcmin2;
        };
  const lowY = y - sy;
  const mLow = lowY > 0 && sy > 0 ? yield* solve(shifted(-1)) : sy === 0 ? m : 0;
  const mHigh = sy > 0 ? yield* solve(shifted(1)) : m;
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

/**
 * Invert Y → M500 at redshift z. Predicted Y (arcmin²) = relation Y500 [Mpc²] / D_A² · (arcmin²/sr)
 * · (S(5)/S(1) of the profile when `definition` is "y5r500"). The error on ln M is
 * σ_lnM = √(σ_Y²/Y² + σ_scatter²) / |d ln Y_pred/d ln M − d ln Y_meas/d ln M|. Throws BAD_VALUE
 * for Y ≤ 0 and NUMERIC when no root lies in the search range. (Runs {@link m500FromYSteps},
 * answering each step from `yArcmin2` and `yErrArcmin2`.)
 */
export function m500FromY(opts: MassFromYOptions): MassFromY {
  const steps = m500FromYSteps({ ...opts, yIsFixed: typeof opts.yArcmin2 === "number" });
  let r = steps.next();
  while (r.done !== true) {
    const t = r.value;
    r = steps.next({ yArcmin2: evalY(opts.yArcmin2, t), yErrArcmin2: evalY(opts.yErrArcmin2, t) });
  }
  return r.value;
}
