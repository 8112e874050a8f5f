/**
 * Sky tiles for large maps: the map is cut into rectangular tiles whose cores partition it; each
 * tile is analysed on its core plus a margin (its "outer" box), with its own noise covariance, and
 * keeps only the results that fall in its core. Processing a survey in overlapping patches, each
 * with a locally estimated covariance, and keeping each object once is common practice in blind
 * SZ searches of wide surveys (e.g. the 10°×10° patches of Planck Collaboration 2014, A&A 571,
 * A29, from memory). The tiling is a science choice — results depend (slightly) on it, like on the
 * apodisation — so a tiled run, a sharded tiled run and a merged one all use the same tiles.
 */
import { UmbraError } from "@umbra/core";
import type { Wcs } from "@umbra/maps";
import type { BandStack, StackBand } from "../stack/types.js";

/** A half-open pixel box [x0, x1) × [y0, y1) in 0-based full-map pixels. */
export interface PixelBox {
  readonly x0: number;
  readonly y0: number;
  readonly x1: number;
  readonly y1: number;
}

/** One tile: its 0-based index, the core it owns and the outer box it is analysed on. */
export interface SkyTile {
  readonly index: number;
  readonly core: PixelBox;
  readonly outer: PixelBox;
}

/** How to tile a map. */
export interface TilingOptions {
  /** Core side in degrees (the map is split into ⌈side/tile⌉ near-equal cores per axis). */
  readonly tileDeg: number;
  /** Margin around each core in arcmin (must be at least the apodisation width). */
  readonly marginArcmin: number;
}

/** Split `n` pixels into `k` near-equal consecutive runs; returns the k + 1 edges. */
function edges(n: number, k: number): number[] {
  return Array.from({ length: k + 1 }, (_, i) => Math.floor((i * n) / k));
}

/**
 * Tiles of an nx × ny map with pixels of `pixelArcmin` (row-major order: x fastest). Cores are
 * near-equal and cover every pixel once; outer boxes are the cores grown by the margin, clipped to
 * the map.
 */
export function planTiles(nx: number, ny: number, pixelArcmin: number, opts: TilingOptions): SkyTile[] {
  if (!(opts.tileDeg > 0) || !Number.isFinite(opts.tileDeg)) throw new UmbraError("BAD_OPTION", `tile side ${opts.tileDeg} deg must be a positive number`, { field: "tile" });
  if (!(opts.marginArcmin >= 0) || !Number.isFinite(opts.marginArcmin)) throw new UmbraError("BAD_OPTION", `tile margin ${opts.marginArcmin} arcmin must be ≥ 0`, { field: "tileMargin" });
  const tilePx = (opts.tileDeg * 60) / pixelArcmin;
  const marginPx = Math.ceil(opts.marginArcmin / pixelArcmin);
  const kx = Math.max(1, Math.ceil(nx / tilePx - 1e-9));
  const ky = Math.max(1, Math.ceil(ny / tilePx - 1e-9));
  const ex = edges(nx, kx);
  const ey = edges(ny, ky);
  const tiles: SkyTile[] = [];
  for (let j = 0; j < ky; j++) {
    for (let i = 0; i < kx; i++) {
      const core = { x0: ex[i] as number, x1: ex[i + 1] as number, y0: ey[j] as number, y1: ey[j + 1] as number };
      const outer = { x0: Math.max(0, core.x0 - marginPx), x1: Math.min(nx, core.x1 + marginPx), y0: Math.max(0, core.y0 - marginPx), y1: Math.min(ny, core.y1 + marginPx) };
      tiles.push({ index: tiles.length, core, outer });
    }
  }
  return tiles;
}

/** Whether the pixel nearest to (px, py) (0-based, full map) lies in `box`. */
export function boxContains(box: PixelBox, px: number, py: number): boolean {
  const ix = Math.round(px);
  const iy = Math.round(py);
  return ix >= box.x0 && ix < box.x1 && iy >= box.y0 && iy < box.y1;
}

/**
 * The tile that owns a position (0-based full-map pixels): the one whose core holds the nearest
 * pixel; a position off the map (or not finite) goes to the tile of the nearest map pixel (or tile
 * 0), where it is flagged off the map like in an untiled run.
 */
export function owningTile(tiles: readonly SkyTile[], nx: number, ny: number, px: number, py: number): number {
  const cx = Number.isFinite(px) ? Math.min(nx - 1, Math.max(0, Math.round(px))) : 0;
  const cy = Number.isFinite(py) ? Math.min(ny - 1, Math.max(0, Math.round(py))) : 0;
  const t = tiles.find((s) => boxContains(s.core, cx, cy));
  if (t === undefined) throw new UmbraError("BAD_OPTION", `no tile holds pixel (${cx}, ${cy}): the tiling does not cover the map`, { field: "tile" });
  return t.index;
}

function cutArray<T extends Float64Array | Uint8Array>(src: T, nx: number, box: PixelBox, make: (n: number) => T): T {
  const w = box.x1 - box.x0;
  const out = make(w * (box.y1 - box.y0));
  for (let y = box.y0; y < box.y1; y++) out.set(src.subarray(y * nx + box.x0, y * nx + box.x1), (y - box.y0) * w);
  return out;
}

/** The WCS of a sub-image starting at 0-based pixel (x0, y0): the reference pixel moves, nothing else. */
export function shiftWcs(wcs: Wcs, x0: number, y0: number): Wcs {
  return { ...wcs, crpix: [wcs.crpix[0] - x0, wcs.crpix[1] - y0], pv: { ...wcs.pv } };
}

/** The part of `stack` inside `box` (maps, ivar, masks and WCS), as a stack of its own. */
export function cutStack(stack: BandStack, box: PixelBox): BandStack {
  if (!(box.x0 >= 0 && box.y0 >= 0 && box.x1 <= stack.nx && box.y1 <= stack.ny && box.x1 > box.x0 && box.y1 > box.y0)) {
    throw new UmbraError("BAD_OPTION", `pixel box [${box.x0}, ${box.x1}) × [${box.y0}, ${box.y1}) is not inside the ${stack.nx}×${stack.ny} map`, { field: "tile" });
  }
  const nx = box.x1 - box.x0;
  const ny = box.y1 - box.y0;
  const bands: StackBand[] = stack.bands.map((b) => ({
    ...b,
    data: cutArray(b.data, stack.nx, box, (n) => new Float64Array(n)),
    ivar: b.ivar === null ? null : cutArray(b.ivar, stack.nx, box, (n) => new Float64Array(n)),
    mask: b.mask === null ? null : cutArray(b.mask, stack.nx, box, (n) => new Uint8Array(n)),
  }));
  return {
    nx,
    ny,
    geometry: { ...stack.geometry, nx, ny },
    wcs: stack.wcs === null ? null : shiftWcs(stack.wcs, box.x0, box.y0),
    bands,
    warnings: stack.warnings,
    inputs: stack.inputs,
  };
}

/** Whether some pixel of `stack` has data in every band (finite and not masked), as the estimators need. */
export function hasData(stack: BandStack): boolean {
  const npix = stack.nx * stack.ny;
  for (let p = 0; p < npix; p++) {
    let ok = true;
    for (const b of stack.bands) {
      if (!Number.isFinite(b.data[p] as number) || (b.mask !== null && b.mask[p] === 0)) {
        ok = false;
        break;
      }
    }
    if (ok) return true;
  }
  return false;
}
