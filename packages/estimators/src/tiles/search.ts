/**
 * Blind search tile by tile (see ./plan.ts): each tile is searched on its outer box (its own
 * covariance and cleaning) and reports the candidates whose peak lies in its core; joining the
 * tiles sorts all candidates by raw S/N and numbers them, exactly as one search of the map does.
 */
import { UmbraError } from "@umbra/core";
import { searchClusters, type Candidate, type SearchOptions, type SearchResult } from "../search/blind.js";
import type { BandStack } from "../stack/types.js";
import { cutStack, hasData, type SkyTile } from "./plan.js";

/** One tile's search: its candidates (full-map pixels, ids not yet given) and diagnostics (null: no data in the tile). */
export interface TileSearch {
  readonly tile: number;
  readonly candidates: readonly Candidate[];
  readonly diagnostics: SearchResult["diagnostics"] | null;
  /** True when no pixel of the tile had data in every band. */
  readonly noData: boolean;
}

/** Search one tile's outer box and keep the candidates in its core (pixel positions on the full map). */
export function searchTile(stack: BandStack, tile: SkyTile, opts: SearchOptions): TileSearch {
  const o = tile.outer;
  const core = { x0: tile.core.x0 - o.x0, x1: tile.core.x1 - o.x0, y0: tile.core.y0 - o.y0, y1: tile.core.y1 - o.y0 };
  const sub = cutStack(stack, o);
  if (!hasData(sub)) return { tile: tile.index, candidates: [], diagnostics: null, noData: true };
  const res = searchClusters(sub, { ...opts, reportBox: core });
  return { tile: tile.index, candidates: res.candidates.map((c) => ({ ...c, px: c.px + o.x0, py: c.py + o.y0 })), diagnostics: res.diagnostics, noData: false };
}

/** All tiles' candidates sorted by raw S/N (ties by tile, then tile order), numbered `prefix-0001`…; NOT_FOUND when a tile is missing. */
export function joinTileSearches(tileCount: number, parts: readonly TileSearch[], prefix = "cand"): Candidate[] {
  const byTile = new Map<number, TileSearch>();
  for (const p of parts) {
    if (byTile.has(p.tile)) throw new UmbraError("BAD_DATA", `tile ${p.tile} was reported twice`, { field: "tile", value: p.tile });
    byTile.set(p.tile, p);
  }
  const missing = Array.from({ length: tileCount }, (_, i) => i).filter((i) => !byTile.has(i));
  if (missing.length > 0) throw new UmbraError("NOT_FOUND", `tiles ${missing.join(", ")} of ${tileCount} have no results`, { field: "tile", value: missing[0] });
  const all: { c: Candidate; tile: number; k: number }[] = [];
  for (let t = 0; t < tileCount; t++) (byTile.get(t) as TileSearch).candidates.forEach((c, k) => all.push({ c, tile: t, k }));
  all.sort((a, b) => b.c.snrRaw - a.c.snrRaw || a.tile - b.tile || a.k - b.k);
  return all.map((a, i) => ({ ...a.c, id: `${prefix}-${String(i + 1).padStart(4, "0")}` }));
}
