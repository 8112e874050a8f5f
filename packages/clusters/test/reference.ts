/** Loads the committed outside-library reference values (fixtures/clusters/reference.json). */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

export interface CosmoRef {
  name: string;
  params: Record<string, number | number[]>;
  Ogamma0: number;
  Onu0: number;
  Ode0: number;
  Ok0: number;
  z: number[];
  efunc: number[];
  comoving_mpc: number[];
  transverse_comoving_mpc: number[];
  angular_diameter_mpc: number[];
  luminosity_mpc: number[];
  lookback_gyr: number[];
  critical_density_msun_mpc3: number[];
  omega_m_z: number[];
  diff_comoving_volume_mpc3_sr: number[];
  pairs: [number, number][];
  angular_diameter_between_mpc: number[];
}

export interface Reference {
  versions: Record<string, string>;
  cosmologies: CosmoRef[];
  planck18: { z: number[]; angular_diameter_mpc: number[] };
  beta_fourier: { xc: number; truncation: number; q: number[]; fourier: number[] };
  gnfw_integrals: { I1: number; I5: number; ycyl_r500_over_ysph_r500: number; central_line_integral_T5: number };
}

export const REFERENCE: Reference = JSON.parse(
  readFileSync(fileURLToPath(new URL("../../../fixtures/clusters/reference.json", import.meta.url)), "utf8"),
) as Reference;
