/**
 * The true clusters of a simulated field: a user list or a Tinker et al. 2008 population, each
 * with its A10 pressure profile (Arnaud et al. 2010, A&A 517, A92, eqs. 11–12 with the α_P mass
 * term), central y0 and Y5R500 from that profile's integrals (so Y follows the profile's own
 * Y–M scaling) with log-normal scatter in ln Y (median-preserving: Y = Y_A10 · exp(σ_lnY N)),
 * kTe from the APP05 M–T relation of @umbra/clusters with log-normal scatter, and line-of-sight
 * velocities (Gaussian with the scenario's σ_v, e.g. ~300 km/s, from memory). The central optical
 * depth assumes isothermal gas: τ0 = y0 · m_e c² / kTe.
 */
import { ARCMIN2_PER_SR, type Rng } from "@umbra/core";
import {
  centralY,
  clusterScale,
  drawHalos,
  gnfwA10,
  haloCountGrid,
  linearPower,
  temperatureFromMassKeV,
  y5r500Arcmin2,
  type Cosmology,
  type HaloCountGrid,
} from "@umbra/clusters";
import { pixelToWorld, worldToPixel, type Wcs } from "@umbra/maps";
import { ELECTRON_REST_ENERGY_KEV } from "@umbra/spectra";
import type { Scenario } from "../scenario/schema.js";

/** One true cluster (units in the names). */
export interface TrueCluster {
  id: string;
  raDeg: number;
  decDeg: number;
  /** 0-based pixel position of the centre (fractional). */
  xPix: number;
  yPix: number;
  m500Msun: number;
  z: number;
  theta500Arcmin: number;
  /** Central Compton y of the unconvolved profile. */
  y0: number;
  /** Y5R500 in arcmin². */
  y5r500Arcmin2: number;
  kTeKeV: number;
  vLosKmS: number;
  /** Central optical depth τ0 = y0 m_e c²/kTe. */
  tau0: number;
  /** Centre inside the pixel grid. */
  inField: boolean;
  /** Centre closer to an edge than the scenario's margin (in θ500): the periodic painting wraps such clusters. */
  nearEdge: boolean;
}

/** The clusters' sky: true clusters and (for mass-function draws) the expected count they were drawn from. */
export interface ClusterDraw {
  clusters: TrueCluster[];
  /** Mass-function integral over the field (null for a user list). */
  expectedCount: number | null;
}

const gridCache = new Map<string, HaloCountGrid>();

/**
 * The halo count grid of a mass-function scenario over the field's area (flat-sky: nx·ny pixels).
 * Grids are cached per (cosmology label, mass and redshift range, area): realisations of one
 * scenario share one grid.
 */
export function scenarioHaloGrid(scenario: Scenario, cosmo: Cosmology): HaloCountGrid | null {
  const mf = scenario.sky.clusters?.massFunction;
  if (!mf) return null;
  const pixSr = scenario.field.pixelArcmin ** 2 / ARCMIN2_PER_SR;
  const key = JSON.stringify([cosmo.label, cosmo.h, cosmo.omegaM0, cosmo.omegaB0, cosmo.sigma8, cosmo.ns, mf, scenario.field.nx, scenario.field.ny, scenario.field.pixelArcmin]);
  const hit = gridCache.get(key);
  if (hit) return hit;
  if (gridCache.size > 16) gridCache.clear();
  const grid = haloCountGrid(linearPower(cosmo), {
    mMinMsun: mf.mMinMsun,
    mMaxMsun: mf.mMaxMsun,
    zMin: mf.zMin,
    zMax: mf.zMax,
    areaSr: scenario.field.nx * scenario.field.ny * pixSr,
  });
  gridCache.set(key, grid);
  return grid;
}

/**
 * Draw the true clusters of a scenario with `rng` (positions, masses and redshifts for a
 * mass-function scenario; scatter, temperatures and velocities for both kinds).
 */
export function drawClusters(scenario: Scenario, cosmo: Cosmology, wcs: Wcs, rng: Rng, grid?: HaloCountGrid | null): ClusterDraw {
  const cs = scenario.sky.clusters;
  if (!cs) return { clusters: [], expectedCount: null };
  const { nx, ny } = scenario.field;
  type Seed = { id: string; xPix: number; yPix: number; raDeg: number; decDeg: number; m500Msun: number; z: number; kTeKeV?: number; vLosKmS?: number };
  const seeds: Seed[] = [];
  let expectedCount: number | null = null;
  const posRng = rng.fork("positions");
  if (cs.list) {
    for (const c of cs.list) {
      const p = worldToPixel(wcs, c.raDeg, c.decDeg);
      seeds.push({ id: c.id, xPix: p.ix, yPix: p.iy, raDeg: c.raDeg, decDeg: c.decDeg, m500Msun: c.m500Msun, z: c.z, kTeKeV: c.kTeKeV, vLosKmS: c.vLosKmS });
    }
  } else {
    const g = grid ?? scenarioHaloGrid(scenario, cosmo)!;
    expectedCount = g.expectedTotal;
    const halos = drawHalos(g, rng.fork("halos"));
    halos.forEach((h, i) => {
      const xPix = posRng.uniform() * nx - 0.5;
      const yPix = posRng.uniform() * ny - 0.5;
      const w = pixelToWorld(wcs, xPix, yPix);
      seeds.push({ id: `${scenario.field.fieldId}-C${String(i + 1).padStart(4, "0")}`, xPix, yPix, raDeg: w.lonDeg, decDeg: w.latDeg, m500Msun: h.m500Msun, z: h.z });
    });
  }
  const scatRng = rng.fork("scatter");
  const h70 = cosmo.h70;
  const clusters = seeds.map((s): TrueCluster => {
    const scale = clusterScale(s.m500Msun, s.z, cosmo);
    const profile = gnfwA10({ m500Msun: s.m500Msun, h70 });
    const scatter = Math.exp(cs.scatterLnY * scatRng.normal());
    const tScatter = Math.exp(cs.scatterLnT * scatRng.normal());
    const vNormal = scatRng.normal();
    const vDraw = cs.velocitySigmaKmS > 0 ? vNormal * cs.velocitySigmaKmS : 0;
    const y0 = centralY(profile, scale) * scatter;
    const kTeKeV = s.kTeKeV ?? temperatureFromMassKeV(s.m500Msun, s.z, cosmo) * tScatter;
    const margin = cs.edgeMarginTheta500 * (scale.theta500Arcmin / scenario.field.pixelArcmin);
    const inField = s.xPix >= -0.5 && s.xPix < nx - 0.5 && s.yPix >= -0.5 && s.yPix < ny - 0.5;
    return {
      id: s.id,
      raDeg: s.raDeg,
      decDeg: s.decDeg,
      xPix: s.xPix,
      yPix: s.yPix,
      m500Msun: s.m500Msun,
      z: s.z,
      theta500Arcmin: scale.theta500Arcmin,
      y0,
      y5r500Arcmin2: y5r500Arcmin2(profile, scale) * scatter,
      kTeKeV,
      vLosKmS: s.vLosKmS ?? vDraw,
      tau0: (y0 * ELECTRON_REST_ENERGY_KEV) / kTeKeV,
      inField,
      nearEdge: !inField || s.xPix < margin - 0.5 || s.yPix < margin - 0.5 || s.xPix > nx - 0.5 - margin || s.yPix > ny - 0.5 - margin,
    };
  });
  return { clusters, expectedCount };
}
