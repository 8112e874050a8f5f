/**
 * Halo counts on the sky: the expected number of halos per (ln M, z) cell in a solid angle,
 * N = dn/dlnM · dV/(dz dΩ) · ΔlnM Δz Ω, and a Poisson draw of a population from it.
 * Comoving volume element of a flat universe: dV/(dz dΩ) = (c/H0) D_C²(z)/E(z)
 * (Hogg 1999, astro-ph/9905116, eq. 28).
 */
import { UmbraError, type Rng } from "@umbra/core";
import { growthFactor } from "./growth.js";
import { meanMatterDensity0, sigmaM, type LinearPower } from "./power.js";
import { deltaCritToMean, tinker08F, tinker08Params } from "./tinker.js";
import type { HaloCosmology } from "./types.js";

/** Speed of light in km/s (exact, SI definition). */
const C_KM_S = 299792.458;

/** Mass/redshift range and sky area of a population. */
export interface HaloRange {
  /** Lower and upper halo mass M500c in M☉. */
  mMinMsun: number;
  mMaxMsun: number;
  zMin: number;
  zMax: number;
  /** Solid angle in steradians. */
  areaSr: number;
  /** Overdensity w.r.t. critical density of the masses (default 500). */
  deltaCrit?: number;
  /** Grid cells along ln M and z (defaults 48 and 40). */
  nMass?: number;
  nZ?: number;
}

/** Expected halo counts on a (ln M, z) grid (cell centres and counts per cell). */
export interface HaloCountGrid {
  lnMEdges: Float64Array;
  zEdges: Float64Array;
  /** Expected number per cell, row-major [iz · nMass + im]. */
  counts: Float64Array;
  /** Sum of `counts`: the mass-function integral over the range. */
  expectedTotal: number;
}

/** One drawn halo: mass M500c (M☉) and redshift. */
export interface DrawnHalo {
  m500Msun: number;
  z: number;
}

/** Comoving volume per unit redshift per steradian in Mpc³ for a flat cosmology (Hogg 1999, eq. 28). */
export function comovingVolumeElementMpc3(cosmo: HaloCosmology, z: number): number {
  const dc = cosmo.comovingDistanceMpc(z);
  return ((C_KM_S / (100 * cosmo.h)) * dc * dc) / cosmo.efunc(z);
}

function checkRange(r: HaloRange): void {
  const bad = (field: string, value: number, why: string): never => {
    throw new UmbraError("BAD_VALUE", `${field} = ${value}: ${why}`, { field, value });
  };
  if (!(r.mMinMsun > 0)) bad("mMinMsun", r.mMinMsun, "must be > 0");
  if (!(r.mMaxMsun > r.mMinMsun)) bad("mMaxMsun", r.mMaxMsun, "must exceed mMinMsun");
  if (!(r.zMin >= 0)) bad("zMin", r.zMin, "must be >= 0");
  if (!(r.zMax > r.zMin)) bad("zMax", r.zMax, "must exceed zMin");
  if (!(r.areaSr > 0 && r.areaSr <= 4 * Math.PI)) bad("areaSr", r.areaSr, "must be in (0, 4π]");
}

/**
 * Expected number of halos per (ln M, z) cell over `range`, from the Tinker et al. 2008 mass
 * function (midpoint rule in each cell) times the comoving volume element (Hogg 1999, eq. 28).
 */
export function haloCountGrid(power: LinearPower, range: HaloRange): HaloCountGrid {
  checkRange(range);
  const cosmo = power.cosmo;
  const nM = range.nMass ?? 48;
  const nZ = range.nZ ?? 40;
  const lnM0 = Math.log(range.mMinMsun);
  const dlnM = (Math.log(range.mMaxMsun) - lnM0) / nM;
  const dz = (range.zMax - range.zMin) / nZ;
  const lnMEdges = new Float64Array(nM + 1);
  const zEdges = new Float64Array(nZ + 1);
  for (let i = 0; i <= nM; i++) lnMEdges[i] = lnM0 + i * dlnM;
  for (let i = 0; i <= nZ; i++) zEdges[i] = range.zMin + i * dz;
  const sigma0 = new Float64Array(nM);
  const dlns = new Float64Array(nM);
  for (let im = 0; im < nM; im++) {
    const s = sigmaM(power, Math.exp(lnM0 + (im + 0.5) * dlnM), 0);
    sigma0[im] = s.sigma;
    dlns[im] = Math.abs(s.dlnSigmaDlnM);
  }
  const rho = meanMatterDensity0(cosmo);
  const counts = new Float64Array(nM * nZ);
  let total = 0;
  for (let iz = 0; iz < nZ; iz++) {
    const z = range.zMin + (iz + 0.5) * dz;
    const d = growthFactor(cosmo, z);
    const p = tinker08Params(deltaCritToMean(cosmo, range.deltaCrit ?? 500, z), z);
    const dv = comovingVolumeElementMpc3(cosmo, z) * dz * range.areaSr;
    for (let im = 0; im < nM; im++) {
      const m = Math.exp(lnM0 + (im + 0.5) * dlnM);
      const n = ((tinker08F(d * sigma0[im]!, p) * rho * dlns[im]!) / m) * dlnM * dv;
      counts[iz * nM + im] = n;
      total += n;
    }
  }
  return { lnMEdges, zEdges, counts, expectedTotal: total };
}

/**
 * Draw a halo population from a count grid: the total is Poisson with mean `expectedTotal`, each
 * halo falls in a cell with probability counts/total and uniformly in ln M and z inside it.
 * Halos come out sorted by decreasing mass (a stable order for catalogues).
 */
export function drawHalos(grid: HaloCountGrid, rng: Rng): DrawnHalo[] {
  const nM = grid.lnMEdges.length - 1;
  const cdf = new Float64Array(grid.counts.length);
  let acc = 0;
  for (let i = 0; i < cdf.length; i++) {
    acc += grid.counts[i]!;
    cdf[i] = acc;
  }
  const n = rng.poisson(grid.expectedTotal);
  const out: DrawnHalo[] = [];
  for (let j = 0; j < n; j++) {
    const u = rng.uniform() * acc;
    let lo = 0;
    let hi = cdf.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (cdf[mid]! > u) hi = mid;
      else lo = mid + 1;
    }
    const iz = Math.floor(lo / nM);
    const im = lo - iz * nM;
    const lnM = grid.lnMEdges[im]! + rng.uniform() * (grid.lnMEdges[im + 1]! - grid.lnMEdges[im]!);
    const z = grid.zEdges[iz]! + rng.uniform() * (grid.zEdges[iz + 1]! - grid.zEdges[iz]!);
    out.push({ m500Msun: Math.exp(lnM), z });
  }
  out.sort((a, b) => b.m500Msun - a.m500Msun || a.z - b.z);
  return out;
}
