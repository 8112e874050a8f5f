/** Loads fixtures/spectra/reference.json (made by fixtures/spectra/make_reference.py with astropy 5.2.1). */
import { readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

export interface Reference {
  astropy: string;
  constants: { h_Js: number; k_B_JpK: number; c_mps: number; m_e_c2_keV: number; sigma_T_m2: number };
  planck: { frequency_ghz: number; temperature_k: number; b_mjy_sr: number; dbdt_mjy_sr_per_k: number }[];
  unit_conversions: { frequency_ghz: number; mjy_sr_per_k_cmb: number; mjy_sr_per_k_rj: number }[];
  maxwell_juttner: { kte_kev: number; theta: number; k3_over_k2: number }[];
  tsz_nonrel: { x_null: number; x_intensity_min: number; x_intensity_max: number; ghz_per_x: number };
}

const here = dirname(fileURLToPath(import.meta.url));
export const REFERENCE: Reference = JSON.parse(readFileSync(join(here, "..", "..", "..", "fixtures", "spectra", "reference.json"), "utf8")) as Reference;
