/**
 * Forced photometry tile by tile (see ./plan.ts): every catalogue cluster belongs to the tile whose
 * core holds it; a tile is measured on its outer box with every catalogued cluster inside that box
 * (neighbours in the margin are fitted for the covariance cleaning too), and reports its own
 * clusters only. The result of a tile depends on nothing but the tile and the catalogue, so tiles
 * can run in any order, on any thread or process, and be joined afterwards.
 */
import { UmbraError } from "@umbra/core";
import { worldToPixel } from "@umbra/maps";
import type { CatalogueCluster, ClusterMeasurement } from "../photometry/types.js";
import type { BandStack } from "../stack/types.js";
import { boxContains, cutStack, hasData, owningTile, type SkyTile } from "./plan.js";

/** Where each catalogue cluster falls: full-map pixel position and owning tile. */
export interface ClusterPlacement {
  readonly px: Float64Array;
  readonly py: Float64Array;
  /** Owning tile index per catalogue row. */
  readonly owner: Int32Array;
}

/** One tile's measurements: the catalogue rows it owns (ascending) and their results (full-map pixels). */
export interface TileMeasurement<D> {
  readonly tile: number;
  readonly rows: readonly number[];
  readonly clusters: readonly ClusterMeasurement[];
  /** The estimator's diagnostics (null for a tile without data). */
  readonly diagnostics: D | null;
  /** True when no pixel of the tile had data in every band (its clusters are flagged, not measured). */
  readonly noData: boolean;
}

/** A cluster that could not be measured: NaNs and `flag` (for clusters of a tile without data). */
function unmeasured(c: CatalogueCluster, px: number, py: number, flag: "masked" | "off_map"): ClusterMeasurement {
  const hasTheta = c.theta500Arcmin != null && (c.theta500Arcmin as number) > 0;
  return {
    id: c.id, raDeg: c.raDeg, decDeg: c.decDeg, px, py,
    theta500Arcmin: hasTheta ? (c.theta500Arcmin as number) : NaN, thetaSource: hasTheta ? "catalog" : "none",
    y0: NaN, y0Err: NaN, yArcmin2: NaN, yErrArcmin2: NaN, snr: NaN, y0ErrRandom: NaN, teKeVUsed: NaN,
    vLosKms: NaN, vLosErrKms: NaN, yMpc2: NaN, yErrMpc2: NaN, m500Msun: NaN, m500ErrMsun: NaN, flags: [flag], scan: null,
  };
}

/** Pixel positions (0-based, full map) and owning tiles of catalogue clusters. */
export function placeClusters(stack: BandStack, tiles: readonly SkyTile[], clusters: readonly CatalogueCluster[]): ClusterPlacement {
  const wcs = stack.wcs;
  if (wcs === null) throw new UmbraError("BAD_DATA", "the band maps carry no celestial WCS: cannot place catalogue positions");
  const n = clusters.length;
  const px = new Float64Array(n);
  const py = new Float64Array(n);
  const owner = new Int32Array(n);
  clusters.forEach((c, k) => {
    const p = Number.isFinite(c.raDeg) && Number.isFinite(c.decDeg) ? worldToPixel(wcs, c.raDeg, c.decDeg) : { ix: NaN, iy: NaN };
    px[k] = p.ix;
    py[k] = p.iy;
    owner[k] = owningTile(tiles, stack.nx, stack.ny, p.ix, p.iy);
  });
  return { px, py, owner };
}

/**
 * Measure one tile: cut the stack to the tile's outer box, call `measure` with the clusters inside
 * it (catalogue order) and keep the tile's own clusters, with pixel positions moved back to the
 * full map.
 */
export function measureTile<D>(
  stack: BandStack,
  clusters: readonly CatalogueCluster[],
  placement: ClusterPlacement,
  tile: SkyTile,
  measure: (sub: BandStack, subClusters: readonly CatalogueCluster[]) => { clusters: readonly ClusterMeasurement[]; diagnostics: D },
): TileMeasurement<D> {
  const chosen: number[] = [];
  for (let k = 0; k < clusters.length; k++) {
    if (placement.owner[k] === tile.index || boxContains(tile.outer, placement.px[k] as number, placement.py[k] as number)) chosen.push(k);
  }
  const sub = cutStack(stack, tile.outer);
  if (!hasData(sub)) {
    // a tile outside the survey footprint: its clusters are on missing data (or off the map)
    const rows = chosen.filter((k) => placement.owner[k] === tile.index);
    const out = rows.map((k) => {
      const px = placement.px[k] as number;
      const py = placement.py[k] as number;
      const on = Number.isFinite(px) && Number.isFinite(py) && px >= -0.5 && py >= -0.5 && px <= stack.nx - 0.5 && py <= stack.ny - 0.5;
      return unmeasured(clusters[k] as CatalogueCluster, px, py, on ? "masked" : "off_map");
    });
    return { tile: tile.index, rows, clusters: out, diagnostics: null, noData: true };
  }
  const res = measure(sub, chosen.map((k) => clusters[k] as CatalogueCluster));
  const rows: number[] = [];
  const out: ClusterMeasurement[] = [];
  chosen.forEach((k, j) => {
    if (placement.owner[k] !== tile.index) return;
    const m = res.clusters[j] as ClusterMeasurement;
    rows.push(k);
    out.push({ ...m, px: m.px + tile.outer.x0, py: m.py + tile.outer.y0 });
  });
  return { tile: tile.index, rows, clusters: out, diagnostics: res.diagnostics, noData: false };
}

/** Join tile measurements into catalogue order; NOT_FOUND naming the rows no tile reported. */
export function joinTileMeasurements(rowCount: number, parts: readonly TileMeasurement<unknown>[]): ClusterMeasurement[] {
  const out: (ClusterMeasurement | undefined)[] = Array.from({ length: rowCount }, () => undefined);
  for (const p of parts) {
    p.rows.forEach((k, j) => {
      if (out[k] !== undefined) throw new UmbraError("BAD_DATA", `catalogue row ${k + 1} was reported by two tiles (tile ${p.tile} and another)`, { row: k + 1 });
      out[k] = p.clusters[j];
    });
  }
  const missing = out.flatMap((m, k) => (m === undefined ? [k + 1] : []));
  if (missing.length > 0) throw new UmbraError("NOT_FOUND", `no tile reported catalogue rows ${missing.slice(0, 10).join(", ")}${missing.length > 10 ? ", …" : ""}`, { row: missing[0] as number });
  return out as ClusterMeasurement[];
}
