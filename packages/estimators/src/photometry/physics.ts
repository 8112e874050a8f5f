/**
 * Cluster physics for photometry from @umbra/clusters: θ500 from M500 and z, kTe from the
 * APP05 M–T relation, D_A, and M500 from Y5R500 by a Y–M relation solved self-consistently with
 * the aperture (the Y measured at each trial θ500; @umbra/clusters' m500FromY).
 */
import {
  a10YmRelation,
  cosmologyPreset,
  m500FromY,
  m500FromYSteps,
  planck2014YmRelation,
  temperatureFromMassKeV,
  theta500Arcmin,
  type YmRelation,
} from "@umbra/clusters";
import { UmbraError } from "@umbra/core";
import type { ClusterPhysics } from "./types.js";

/** Y–M relations by name. */
export const YM_RELATIONS = ["a10", "planck2014"] as const;
export type YmRelationName = (typeof YM_RELATIONS)[number];

/** {@link ClusterPhysics} for a cosmology preset name and a Y–M relation name. */
export function clusterPhysics(cosmologyName: string, relationName: string): ClusterPhysics {
  const cosmo = cosmologyPreset(cosmologyName);
  let relation: YmRelation;
  if (relationName === "a10") relation = a10YmRelation();
  else if (relationName === "planck2014") relation = planck2014YmRelation();
  else throw new UmbraError("BAD_OPTION", `unknown scaling relation '${relationName}' (use ${YM_RELATIONS.join(" or ")})`, { field: "relation", value: relationName });
  return {
    theta500ArcminFromMass: (m, z) => theta500Arcmin(m, z, cosmo),
    temperatureKeVFromMass: (m, z) => temperatureFromMassKeV(m, z, cosmo),
    angularDiameterDistanceMpc: (z) => cosmo.angularDiameterDistanceMpc(z),
    massFromY(yAt, z) {
      const r = m500FromY({
        yArcmin2: (th) => yAt(th).yArcmin2,
        yErrArcmin2: (th) => yAt(th).yErrArcmin2,
        z,
        cosmo,
        relation,
        definition: "y5r500",
      });
      return { m500Msun: r.m500Msun, m500ErrMsun: r.m500ErrMsun };
    },
    *massFromYSteps(z) {
      const r = yield* m500FromYSteps({ z, cosmo, relation, definition: "y5r500" });
      return { m500Msun: r.m500Msun, m500ErrMsun: r.m500ErrMsun };
    },
  };
}
