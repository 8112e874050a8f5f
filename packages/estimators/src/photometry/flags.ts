/**
 * Per-cluster quality flags from the pixel position: off the map, on a masked or missing area,
 * or too near the tapered edge. A flagged cluster gets NaNs; the batch goes on.
 */

/** Flag names written into the `flags` column (joined by "|"). */
export type ClusterFlag = "off_map" | "masked" | "edge" | "near_mask" | "fit_failed" | "no_size" | "scan_edge" | "no_temperature" | "mass_failed" | "point_source";

/** Flags that make the measurement unusable (outputs NaN). */
export const FATAL_FLAGS: readonly ClusterFlag[] = ["off_map", "masked", "edge", "fit_failed", "no_size"];

/**
 * Flags for the pixel position (px, py) (0-based) with a check radius `radiusPix`: `off_map`
 * outside the grid; `masked` when the nearest pixel was missing/masked or over a quarter of the
 * disc was; `near_mask` when any disc pixel was; `edge` when any disc pixel has window < 0.999.
 */
export function positionFlags(
  px: number,
  py: number,
  radiusPix: number,
  nx: number,
  ny: number,
  window: Float64Array,
  inpainted: Uint8Array,
): ClusterFlag[] {
  if (!Number.isFinite(px) || !Number.isFinite(py) || px < -0.5 || py < -0.5 || px > nx - 0.5 || py > ny - 0.5) return ["off_map"];
  const flags: ClusterFlag[] = [];
  const cx = Math.round(px);
  const cy = Math.round(py);
  const r = Math.max(1, radiusPix);
  const r2 = r * r;
  let nDisc = 0;
  let nBad = 0;
  let edge = false;
  for (let y = Math.floor(py - r); y <= Math.ceil(py + r); y++) {
    for (let x = Math.floor(px - r); x <= Math.ceil(px + r); x++) {
      if ((x - px) ** 2 + (y - py) ** 2 > r2) continue;
      if (x < 0 || y < 0 || x >= nx || y >= ny) {
        edge = true;
        continue;
      }
      nDisc++;
      const p = y * nx + x;
      if (inpainted[p] === 1) nBad++;
      if ((window[p] as number) < 0.999) edge = true;
    }
  }
  if (inpainted[cy * nx + cx] === 1 || nBad > 0.25 * nDisc) flags.push("masked");
  else if (nBad > 0) flags.push("near_mask");
  if (edge) flags.push("edge");
  return flags;
}
