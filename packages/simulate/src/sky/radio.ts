/**
 * Radio point sources: a Poisson number from a (broken) power-law differential count
 * dN/dS ∝ S^(−γ) between the scenario's flux limits, each with a spectral index α drawn from a
 * Gaussian (S ∝ ν^α), placed uniformly in the field or, for a chosen fraction, within 0.5 θ500 of
 * a cluster centre. Sources sit at pixel centres (their truth positions say so).
 */
import { RAD_PER_ARCMIN, type Rng } from "@umbra/core";
import { pixelToWorld, type Wcs } from "@umbra/maps";
import type { Scenario } from "../scenario/schema.js";
import type { TrueCluster } from "./clusterTruth.js";

/** One true radio source. */
export interface TrueRadioSource {
  id: string;
  raDeg: number;
  decDeg: number;
  /** 0-based pixel (integer: sources sit at pixel centres). */
  xPix: number;
  yPix: number;
  /** Flux density in Jy at the scenario's reference frequency. */
  fluxJyRef: number;
  /** Spectral index α of S ∝ ν^α. */
  alpha: number;
  /** Id of the host cluster, or "" for a field source. */
  hostClusterId: string;
}

/** Integral of S^(−γ) dS from a to b. */
function powerIntegral(a: number, b: number, g: number): number {
  return Math.abs(g - 1) < 1e-12 ? Math.log(b / a) : (b ** (1 - g) - a ** (1 - g)) / (1 - g);
}

/** Inverse CDF of dN/dS ∝ S^(−γ) on [a, b] at u in [0, 1). */
function powerInverse(a: number, b: number, g: number, u: number): number {
  if (Math.abs(g - 1) < 1e-12) return a * (b / a) ** u;
  const p = 1 - g;
  return (a ** p + u * (b ** p - a ** p)) ** (1 / p);
}

/**
 * Draw a flux density (Jy) from dN/dS ∝ S^(−γ1) below the break and ∝ S_b^(γ2−γ1) S^(−γ2) above it
 * (continuous at the break), or a single power law when there is no break.
 */
export function drawFluxJy(r: NonNullable<Scenario["sky"]["radio"]>, rng: Rng): number {
  const u = rng.uniform();
  if (r.breakFluxJy === undefined || r.slopeAbove === undefined) return powerInverse(r.minFluxJy, r.maxFluxJy, r.slope, u);
  const sb = r.breakFluxJy;
  const lowW = powerIntegral(r.minFluxJy, sb, r.slope);
  const highW = sb ** (r.slopeAbove - r.slope) * powerIntegral(sb, r.maxFluxJy, r.slopeAbove);
  const f = lowW / (lowW + highW);
  return u < f ? powerInverse(r.minFluxJy, sb, r.slope, u / f) : powerInverse(sb, r.maxFluxJy, r.slopeAbove, (u - f) / (1 - f));
}

/** Draw the radio sources of a scenario (empty when it has none). */
export function drawRadioSources(scenario: Scenario, wcs: Wcs, clusters: readonly TrueCluster[], rng: Rng): TrueRadioSource[] {
  const r = scenario.sky.radio;
  if (!r) return [];
  const { nx, ny, pixelArcmin } = scenario.field;
  const areaDeg2 = (nx * ny * pixelArcmin * pixelArcmin) / 3600;
  const n = rng.poisson(r.densityPerDeg2 * areaDeg2);
  const hosts = clusters.filter((c) => c.inField);
  const out: TrueRadioSource[] = [];
  for (let i = 0; i < n; i++) {
    const flux = drawFluxJy(r, rng);
    const alpha = r.alphaMean + r.alphaSigma * rng.normal();
    let x: number;
    let y: number;
    let host = "";
    if (hosts.length > 0 && rng.uniform() < r.fractionInClusters) {
      const c = hosts[Math.floor(rng.uniform() * hosts.length)]!;
      const rad = 0.5 * (c.theta500Arcmin / pixelArcmin) * Math.sqrt(rng.uniform());
      const phi = 2 * Math.PI * rng.uniform();
      x = c.xPix + rad * Math.cos(phi);
      y = c.yPix + rad * Math.sin(phi);
      host = c.id;
    } else {
      x = rng.uniform() * nx - 0.5;
      y = rng.uniform() * ny - 0.5;
    }
    const ix = Math.min(nx - 1, Math.max(0, Math.round(x)));
    const iy = Math.min(ny - 1, Math.max(0, Math.round(y)));
    const w = pixelToWorld(wcs, ix, iy);
    out.push({ id: `${scenario.field.fieldId}-R${String(i + 1).padStart(5, "0")}`, raDeg: w.lonDeg, decDeg: w.latDeg, xPix: ix, yPix: iy, fluxJyRef: flux, alpha, hostClusterId: host });
  }
  return out;
}

/** Pixel solid angle in sr of a scenario's field. */
export function pixelSolidAngleSr(field: Scenario["field"]): number {
  return (field.pixelArcmin * RAD_PER_ARCMIN) ** 2;
}
