/**
 * Named parameter sets (names are umbra's own), each taken from its paper.
 */
import { UmbraError } from "@umbra/core";
import { TCMB0_K } from "../constants.js";
import { createCosmology } from "./create.js";
import type { Cosmology, CosmologyParams } from "./types.js";

/** Names accepted by {@link cosmologyPreset}. */
export type CosmologyPresetName = "concordance" | "cmb2018";

/** Every preset name, in a fixed order. */
export const COSMOLOGY_PRESET_NAMES: readonly CosmologyPresetName[] = ["concordance", "cmb2018"];

const H_CMB2018 = 0.6766;

/**
 * The parameters behind each preset.
 *
 * - `concordance`: flat, H0 = 70 km/s/Mpc, Ω_m = 0.3, Ω_Λ = 0.7, no radiation — the reference
 *   cosmology of cluster papers such as Arnaud et al. 2010 (A&A 517, A92, Sect. 1) and the Planck
 *   SZ cluster papers. It carries no baryon density, σ8 or n_s (no paper fixes them for it):
 *   pass your own to {@link createCosmology} for a mass function.
 * - `cmb2018`: the Planck 2018 TT,TE,EE+lowE+lensing+BAO best fit (Planck Collaboration 2020,
 *   A&A 641, A6, Table 2, last column): H0 = 67.66, Ω_b h² = 0.02242, Ω_c h² = 0.11933,
 *   σ8 = 0.8102, n_s = 0.9665, flat, with T0 = 2.7255 K (Fixsen 2009, ApJ 707, 916), N_eff = 3.046
 *   and one massive neutrino of 0.06 eV (the paper's baseline, its Sect. 2.1). Ω_m0 here counts
 *   baryons + cold dark matter only; the neutrino is carried separately.
 */
export const COSMOLOGY_PRESETS: Readonly<Record<CosmologyPresetName, CosmologyParams>> = Object.freeze({
  concordance: { label: "concordance", H0KmSMpc: 70, omegaM0: 0.3, tcmb0K: 0 },
  cmb2018: {
    label: "cmb2018",
    H0KmSMpc: 100 * H_CMB2018,
    omegaM0: (0.02242 + 0.11933) / (H_CMB2018 * H_CMB2018),
    omegaB0: 0.02242 / (H_CMB2018 * H_CMB2018),
    tcmb0K: TCMB0_K,
    nEff: 3.046,
    massiveNuEV: [0.06],
    sigma8: 0.8102,
    ns: 0.9665,
  },
});

/** The named cosmology `name` ("concordance" | "cmb2018"); throws BAD_VALUE for an unknown name. */
export function cosmologyPreset(name: string): Cosmology {
  if (!(COSMOLOGY_PRESET_NAMES as readonly string[]).includes(name)) {
    throw new UmbraError("BAD_VALUE", `unknown cosmology preset '${name}' (known: ${COSMOLOGY_PRESET_NAMES.join(", ")})`, {
      field: "cosmology",
      value: name,
    });
  }
  return createCosmology(COSMOLOGY_PRESETS[name as CosmologyPresetName]);
}
