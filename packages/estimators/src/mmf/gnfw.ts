/**
 * The A10 generalised-NFW pressure profile (Arnaud et al. 2010, A&A 517, A92, eqs. 11–12),
 * projected and truncated at 5 R500, as a {@link ProfileShape} with θ500 as its scale; its 2-D
 * transform comes from @umbra/clusters (projection-slice theorem, tabulated).
 */
import { fourierShape, gnfwA10, profileFourierAtEll } from "@umbra/clusters";
import type { ProfileShape } from "./profile.js";

/** The A10 universal profile shape (no mass term), truncated at 5 R500. */
export function a10ProfileShape(): ProfileShape {
  const shape = fourierShape(gnfwA10(), { truncation: 5, qMax: 2000 });
  return {
    name: "gnfw-a10",
    fourierUnitScale(u) {
      // θ500 = 1 rad: τ̃(ℓ; 1) = F̃(ℓ); u = 0 is handled by the table's first node
      return profileFourierAtEll(shape, 1, u);
    },
  };
}
