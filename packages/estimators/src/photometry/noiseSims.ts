/**
 * The band covariance from noise-only simulations instead of the data: each simulated stack (same
 * grid and bands as the data, no clusters) is prepared like the data (inpainting, taper), its
 * beam-deconvolved covariance estimated on the data's bins, and the estimates averaged with equal
 * weights. With this covariance no cluster cleaning is needed (the simulations hold no clusters).
 */
import { UmbraError } from "@umbra/core";
import { deconvolveBeams, estimateBandCovariance, type CovarianceOptions } from "../noise/estimate.js";
import type { BandCovariance } from "../noise/types.js";
import type { BandStack } from "../stack/types.js";
import { prepareStack } from "./prepare.js";

/** Average covariance of noise-only `sims` (each a {@link BandStack} on the data's grid). */
export function covarianceFromNoiseSimulations(sims: readonly BandStack[], opts: CovarianceOptions & { apodisationArcmin?: number } = {}): BandCovariance {
  if (sims.length === 0) throw new UmbraError("BAD_OPTION", "no noise simulations given", { field: "noiseSims" });
  const first = sims[0] as BandStack;
  let sum: BandCovariance | null = null;
  let values: Float64Array | null = null;
  for (const [k, s] of sims.entries()) {
    if (s.nx !== first.nx || s.ny !== first.ny || s.bands.length !== first.bands.length) {
      throw new UmbraError("BAD_DATA", `noise simulation ${k + 1} has a different grid or band count from the first`, { field: "noiseSims" });
    }
    const prep = prepareStack(s, { apodisationArcmin: opts.apodisationArcmin });
    const beams = s.bands.map((b) => b.beam);
    const cov = estimateBandCovariance(deconvolveBeams(prep.spectra, beams, prep.ells), prep.plan.layout, s.geometry, prep.ells, {
      windowMeanSquare: prep.windowMeanSquare,
      beams,
      bandNames: s.bands.map((b) => b.name),
      ...opts,
    });
    if (sum === null) {
      sum = cov;
      values = Float64Array.from(cov.values);
    } else {
      if (cov.values.length !== (values as Float64Array).length) throw new UmbraError("INTERNAL", "noise simulations gave different ell bins");
      for (let q = 0; q < cov.values.length; q++) (values as Float64Array)[q] += cov.values[q] as number;
    }
  }
  const s = sum as BandCovariance;
  const v = (values as Float64Array).map((x) => x / sims.length);
  return { ...s, values: v };
}
