/**
 * The isothermal β model (Cavaliere & Fusco-Femiano 1976, A&A 49, 137): n_e ∝ (1 + r²/r_c²)^(−3β/2)
 * and, at constant temperature, the same shape for the pressure:
 *   P/P500 = p0 (1 + x²/x_c²)^(−3β/2),  x = r/R500, x_c = r_c/R500.
 */
import { requireFinite } from "@umbra/core";
import type { PressureProfile } from "./types.js";

/** Options of {@link betaModel}. */
export interface BetaModelOptions {
  /** Core radius in units of R500 (x_c = r_c/R500). */
  coreRadiusR500: number;
  /** The β slope (> 1/3 for a finite projection through an untruncated model). */
  beta: number;
  /** Central pressure in units of P500 (default 1). */
  centralRatio?: number;
}

/** An isothermal β-model {@link PressureProfile} (Cavaliere & Fusco-Femiano 1976). */
export function betaModel(opts: BetaModelOptions): PressureProfile {
  const xc = requireFinite("coreRadiusR500", opts.coreRadiusR500, (v) => v > 0, "not positive");
  const beta = requireFinite("beta", opts.beta, (v) => v > 0, "not positive");
  const p0 = requireFinite("centralRatio", opts.centralRatio ?? 1, (v) => v > 0, "not positive");
  const k = -1.5 * beta;
  return {
    label: `beta model (beta = ${beta}, xc = ${xc})`,
    cuspSlope: 0,
    key: `beta:${xc}:${beta}:${p0}`,
    pressureRatio: (x) => p0 * (1 + (x * x) / (xc * xc)) ** k,
  };
}
