/**
 * The asymptotic expansion of the relativistic tSZ effect in powers of θe = k_BT_e/(m_e c²) to
 * fifth order (Y0 … Y4) by Itoh, Kohyama & Nozawa 1998 (ApJ 502, 7, eqs. 2.25–2.30), with
 * X̃ = X coth(X/2) and S̃ = X / sinh(X/2):
 *   ΔI/I0 = y X⁴eˣ/(eˣ − 1)² [Y0 + θe Y1 + θe² Y2 + θe³ Y3 + θe⁴ Y4].
 * It is an asymptotic series: accurate at kTe ≲ 10–15 keV and X ≲ 10, diverging above. Used here
 * as an outside check of the exact integral and for the crossover formula.
 */
import { thetaFromKeV } from "./constants.js";
import { dimensionlessFrequency } from "./planck.js";
import { tszShape } from "./tsz.js";

/**
 * The Itoh, Kohyama & Nozawa 1998 (ApJ 502, 7, eqs. 2.26–2.30) coefficients [Y0, Y1, Y2, Y3, Y4] at
 * dimensionless frequency X.
 */
export function itohCoefficients(X: number): [number, number, number, number, number] {
  const xt = X / Math.tanh(X / 2);
  const st = X / Math.sinh(X / 2);
  const s2 = st * st;
  const s4 = s2 * s2;
  const s6 = s4 * s2;
  const s8 = s4 * s4;
  const x2 = xt * xt;
  const x3 = x2 * xt;
  const x4 = x2 * x2;
  const x5 = x4 * xt;
  const x6 = x3 * x3;
  const x7 = x6 * xt;
  const x8 = x4 * x4;
  const x9 = x8 * xt;
  const Y0 = tszShape(X);
  const Y1 = -10 + (47 / 2) * xt - (42 / 5) * x2 + (7 / 10) * x3 + s2 * (-21 / 5 + (7 / 5) * xt);
  const Y2 =
    -15 / 2 +
    (1023 / 8) * xt -
    (868 / 5) * x2 +
    (329 / 5) * x3 -
    (44 / 5) * x4 +
    (11 / 30) * x5 +
    s2 * (-434 / 5 + (658 / 5) * xt - (242 / 5) * x2 + (143 / 30) * x3) +
    s4 * (-44 / 5 + (187 / 60) * xt);
  const Y3 =
    15 / 2 +
    (2505 / 8) * xt -
    (7098 / 5) * x2 +
    (14253 / 10) * x3 -
    (18594 / 35) * x4 +
    (12059 / 140) * x5 -
    (128 / 21) * x6 +
    (16 / 105) * x7 +
    s2 * (-7098 / 10 + (14253 / 5) * xt - (102267 / 35) * x2 + (156767 / 140) * x3 - (1216 / 7) * x4 + (64 / 7) * x5) +
    s4 * (-18594 / 35 + (205003 / 280) * xt - (1920 / 7) * x2 + (1024 / 35) * x3) +
    s6 * (-544 / 21 + (992 / 105) * xt);
  const Y4 =
    -135 / 32 +
    (30375 / 128) * xt -
    (62391 / 10) * x2 +
    (614727 / 40) * x3 -
    (124389 / 10) * x4 +
    (355703 / 80) * x5 -
    (16568 / 21) * x6 +
    (7516 / 105) * x7 -
    (22 / 7) * x8 +
    (11 / 210) * x9 +
    s2 *
      (-62391 / 20 +
        (614727 / 20) * xt -
        (1368279 / 20) * x2 +
        (4624139 / 80) * x3 -
        (157396 / 7) * x4 +
        (30064 / 7) * x5 -
        (2717 / 7) * x6 +
        (2761 / 210) * x7) +
    s4 * (-124389 / 10 + (6046951 / 160) * xt - (248520 / 7) * x2 + (481024 / 35) * x3 - (15972 / 7) * x4 + (18689 / 140) * x5) +
    s6 * (-70414 / 21 + (465992 / 105) * xt - (11792 / 7) * x2 + (19778 / 105) * x3) +
    s8 * (-682 / 7 + (7601 / 210) * xt);
  return [Y0, Y1, Y2, Y3, Y4];
}

/**
 * Relativistic tSZ ΔT/T0 per unit y from the Itoh, Kohyama & Nozawa 1998 (ApJ 502, 7, eq. 2.25)
 * expansion truncated after θe^order (order 0…4), at ν in GHz and kTe in keV.
 */
export function tszItohExpansion(frequencyGHz: number, kTeKeV: number, order = 4): number {
  const th = thetaFromKeV(kTeKeV);
  const c = itohCoefficients(dimensionlessFrequency(frequencyGHz));
  let s = 0;
  for (let k = Math.min(4, Math.max(0, Math.floor(order))); k >= 0; k--) s = s * th + (c[k] as number);
  return s;
}

/**
 * Crossover (null) of the relativistic tSZ in x = hν/k_BT0:
 * x0 = 3.830 (1 + 1.1674 θe − 0.8533 θe²) (Itoh, Kohyama & Nozawa 1998, ApJ 502, 7, their crossover fit).
 */
export function tszCrossoverItoh(kTeKeV: number): number {
  const th = thetaFromKeV(kTeKeV);
  return 3.830 * (1 + 1.1674 * th - 0.8533 * th * th);
}
