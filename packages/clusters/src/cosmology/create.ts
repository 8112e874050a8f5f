/**
 * Building a {@link Cosmology}: Λ/w0–wa dark energy, curvature, photons, massless and massive
 * neutrinos, computed the way astropy 5.2.1 does it so the two agree to 1e-6 or better:
 *
 * E(z)² = Ω_r(z)(1+z)⁴ + Ω_m(1+z)³ + Ω_k(1+z)² + Ω_DE f_DE(z)
 *
 * with f_DE = (1+z)^{3(1+w0+wa)} exp(−3 wa z/(1+z)) (Linder 2003, PRL 90, 091301, eq. 5 integrated),
 * Ω_γ = 4σ_SB T0⁴ / (c³ ρ_c0), and the neutrino density relative to photons
 * 0.2271 N_eff/N_ν [N_massless + Σ_i (1 + (0.3173 y_i/(1+z))^1.83)^{1/1.83}], y_i = m_i c²/(k T_ν0),
 * the fitting formula of Komatsu et al. 2011 (ApJS 192, 18, eq. 26) as astropy applies it.
 * Distances follow Hogg 1999 (astro-ph/9905116).
 */
import { UmbraError, requireFinite } from "@umbra/core";
import { integrate } from "../numerics/quadrature.js";
import { C_KM_PER_S, G_SI, GYR_S, K_B_EV_PER_K, MPC_M, MSUN_KG, NU_PER_PHOTON, SIGMA_SB_SI, C_M_PER_S, TNU_PER_TCMB } from "../constants.js";
import type { Cosmology, CosmologyParams } from "./types.js";

const QUAD = { rtol: 1e-12, atol: 0, maxPanels: 4000 };

function badValue(field: string, value: unknown, why: string): UmbraError {
  return new UmbraError("BAD_VALUE", `${field} = ${String(value)}: ${why}`, { field, value });
}

/** Throw BAD_VALUE unless z is a finite redshift ≥ 0. */
export function requireRedshift(z: number, field = "z"): number {
  return requireFinite(field, z, (v) => v >= 0, "a redshift below 0");
}

/**
 * Create a background cosmology from `params` (validated: H0 > 0, Ω_m ≥ 0, T0 ≥ 0, N_eff ≥ 0,
 * neutrino masses ≥ 0 and no more massive species than floor(N_eff), and E(z)² > 0 for
 * 0 ≤ z ≤ 1e5, i.e. a big bang). Throws UmbraError BAD_VALUE naming the offending value.
 */
export function createCosmology(params: CosmologyParams): Cosmology {
  const H0 = requireFinite("H0KmSMpc", params.H0KmSMpc, (v) => v > 0, "not positive");
  const om = requireFinite("omegaM0", params.omegaM0, (v) => v >= 0, "negative");
  const ob = requireFinite("omegaB0", params.omegaB0 ?? 0, (v) => v >= 0 && v <= om, "outside [0, omegaM0]");
  const w0 = requireFinite("w0", params.w0 ?? -1);
  const wa = requireFinite("wa", params.wa ?? 0);
  const tcmb = requireFinite("tcmb0K", params.tcmb0K ?? 0, (v) => v >= 0, "negative");
  const nEff = requireFinite("nEff", params.nEff ?? 3.046, (v) => v >= 0, "negative");
  const masses = (params.massiveNuEV ?? []).map((m, i) => requireFinite(`massiveNuEV[${i}]`, m, (v) => v >= 0, "negative"));
  const massive = masses.filter((m) => m > 0);
  const nNu = Math.floor(nEff);
  if (massive.length > nNu) throw badValue("massiveNuEV", masses.join(","), `more massive species than floor(nEff) = ${nNu}`);
  if (params.sigma8 !== undefined) requireFinite("sigma8", params.sigma8, (v) => v > 0, "not positive");
  if (params.ns !== undefined) requireFinite("ns", params.ns);

  const H0PerS = (H0 * 1000) / MPC_M;
  const rhoCrit0SI = (3 * H0PerS * H0PerS) / (8 * Math.PI * G_SI); // kg/m³
  const ogamma = tcmb > 0 ? ((4 * SIGMA_SB_SI) / C_M_PER_S ** 3) * tcmb ** 4 / rhoCrit0SI : 0;
  const nuY = tcmb > 0 ? massive.map((m) => m / (K_B_EV_PER_K * TNU_PER_TCMB * tcmb)) : [];
  const nMassless = nNu - nuY.length;
  const neffPerNu = nNu > 0 ? nEff / nNu : 0;
  // neutrino density relative to photons (astropy's nu_relative_density)
  const nuRel = (z: number): number => {
    if (nuY.length === 0) return NU_PER_PHOTON * nEff;
    let rel = nMassless;
    for (const y of nuY) rel += (1 + (0.3173 * y / (1 + z)) ** 1.83) ** 0.54644808743;
    return NU_PER_PHOTON * neffPerNu * rel;
  };
  const onu = ogamma * nuRel(0);
  const omasslessNu = ogamma * NU_PER_PHOTON * (nuY.length === 0 ? nEff : neffPerNu * nMassless);
  let ode: number;
  if (params.omegaDE0 === undefined) ode = 1 - om - ogamma - onu;
  else ode = requireFinite("omegaDE0", params.omegaDE0);
  const ok = params.omegaDE0 === undefined ? 0 : 1 - om - ode - ogamma - onu;

  const deScale = (z: number): number => {
    if (w0 === -1 && wa === 0) return 1;
    const zp1 = 1 + z;
    return zp1 ** (3 * (1 + w0 + wa)) * Math.exp((-3 * wa * z) / zp1);
  };
  const e2 = (z: number): number => {
    const zp1 = 1 + z;
    const or = ogamma * (1 + nuRel(z));
    return zp1 * zp1 * (zp1 * (zp1 * or + om) + ok) + ode * deScale(z);
  };
  // a big bang: E(z)² > 0 from today back to z = 1e5 (checked on a dense logarithmic grid)
  for (let i = 0; i <= 800; i++) {
    const z = i === 0 ? 0 : 10 ** (-4 + (9 * i) / 800);
    const v = e2(z);
    if (!(v > 0)) {
      throw badValue(
        "omegaDE0",
        ode,
        `no big bang: E(z)^2 = ${v.toPrecision(4)} <= 0 at z = ${z.toPrecision(4)} (omegaM0 = ${om}, omegaK0 = ${ok.toPrecision(6)})`,
      );
    }
  }
  const efunc = (z: number): number => Math.sqrt(e2(z));
  const dH = C_KM_PER_S / H0;
  const tH = 1 / H0PerS / GYR_S;
  const rhoCrit0 = (rhoCrit0SI * MPC_M ** 3) / MSUN_KG;
  const sqrtOk = Math.sqrt(Math.abs(ok));

  const dc = (z1: number, z2: number): number => dH * integrate((z) => 1 / efunc(z), z1, z2, QUAD);
  const toTransverse = (dcMpc: number): number => {
    if (ok === 0) return dcMpc;
    const x = (sqrtOk * dcMpc) / dH;
    return ok > 0 ? (dH / sqrtOk) * Math.sinh(x) : (dH / sqrtOk) * Math.sin(x);
  };
  const zCheck = (z: number, field = "z"): number => requireRedshift(z, field);

  const cosmo: Cosmology = {
    label: params.label ?? "custom",
    h: H0 / 100,
    h70: H0 / 70,
    H0KmSMpc: H0,
    omegaM0: om,
    omegaB0: ob,
    omegaDE0: ode,
    omegaK0: ok,
    omegaR0: ogamma + omasslessNu,
    omegaGamma0: ogamma,
    omegaNu0: onu,
    w0,
    wa,
    tcmb0K: tcmb,
    ...(tcmb > 0 ? { tcmbK: tcmb } : {}),
    nEff,
    massiveNuEV: massive,
    ...(params.sigma8 !== undefined ? { sigma8: params.sigma8 } : {}),
    ...(params.ns !== undefined ? { ns: params.ns } : {}),
    hubbleDistanceMpc: dH,
    hubbleTimeGyr: tH,
    efunc: (z) => efunc(zCheck(z)),
    hubbleKmSMpc: (z) => H0 * efunc(zCheck(z)),
    comovingDistanceMpc: (z) => dc(0, zCheck(z)),
    transverseComovingDistanceMpc: (z) => toTransverse(dc(0, zCheck(z))),
    angularDiameterDistanceMpc: (z) => toTransverse(dc(0, zCheck(z))) / (1 + z),
    angularDiameterDistanceBetweenMpc: (z1, z2) => {
      zCheck(z1, "z1");
      zCheck(z2, "z2");
      if (z2 < z1) throw badValue("z2", z2, `below z1 = ${z1}`);
      return toTransverse(dc(z1, z2)) / (1 + z2);
    },
    luminosityDistanceMpc: (z) => toTransverse(dc(0, zCheck(z))) * (1 + z),
    lookbackTimeGyr: (z) => tH * integrate((x) => 1 / ((1 + x) * efunc(x)), 0, zCheck(z), QUAD),
    criticalDensityMsunPerMpc3: (z) => rhoCrit0 * e2(zCheck(z)),
    omegaMz: (z) => (om * (1 + zCheck(z)) ** 3) / e2(z),
    differentialComovingVolumeMpc3PerSr: (z) => {
      const dm = toTransverse(dc(0, zCheck(z)));
      return (dH * dm * dm) / efunc(z);
    },
  };
  return Object.freeze(cosmo);
}
