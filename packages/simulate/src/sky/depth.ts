/**
 * Relative depth (inverse-variance weight, 1 at the deepest point) of the white noise over the
 * field: uniform, radial (deep centre: 1 − (1 − w_min)(r/r_corner)²) or a linear gradient along x
 * (w_min at the left edge to 1 at the right). Invented survey shapes, not a model of a real one.
 */
import type { Scenario } from "../scenario/schema.js";

/** The relative inverse-variance weight per pixel (row-major, x fastest), or null for uniform depth. */
export function relativeDepth(scenario: Scenario): Float64Array | null {
  const d = scenario.depth;
  if (d.kind === "uniform") return null;
  const { nx, ny } = scenario.field;
  const w = new Float64Array(nx * ny);
  const cx = (nx - 1) / 2;
  const cy = (ny - 1) / 2;
  const r2max = cx * cx + cy * cy;
  for (let iy = 0; iy < ny; iy++) {
    for (let ix = 0; ix < nx; ix++) {
      w[iy * nx + ix] =
        d.kind === "radial"
          ? 1 - (1 - d.minRelative) * (((ix - cx) ** 2 + (iy - cy) ** 2) / r2max)
          : d.minRelative + (1 - d.minRelative) * (nx > 1 ? ix / (nx - 1) : 1);
    }
  }
  return w;
}
