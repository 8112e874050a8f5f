/**
 * What `umbra measure` and `umbra search` compute, as plain settings (JSON, so that they can be
 * hashed into a run key and posted to worker threads) and functions that run them on a band stack:
 * used for untiled runs, for each sky tile in-process, and in worker threads (./worker.ts).
 */
import { UmbraError } from "@umbra/core";
import {
  a10ProfileShape,
  bandSed,
  clusterPhysics,
  loadBandStack,
  measureCatalogByIlc,
  measureClusters,
  measureTile,
  placeClusters,
  planTiles,
  searchTile,
  stackSedProvider,
  type BandStack,
  type CatalogueCluster,
  type ClusterMeasurement,
  type MeasureOptions,
  type MeasureResult,
  type SearchOptions,
  type SkyTile,
  type TileMeasurement,
  type TileSearch,
  type TilingOptions,
} from "@umbra/estimators";
import { RAD_PER_ARCMIN } from "@umbra/core";

/** Settings of a forced-photometry run (CLI options after parsing). */
export interface MeasureSettings {
  readonly method: "mmf" | "ilc";
  readonly deproject: readonly string[];
  readonly dustBeta: number;
  readonly dustTempK: number;
  readonly ksz: boolean;
  readonly relativistic: boolean;
  readonly randomCount: number;
  readonly seed: number;
  readonly scanSizesArcmin: readonly number[] | null;
  readonly apodisationArcmin: number;
  readonly iterations: number;
  readonly cosmology: string;
  readonly relation: string;
}

/** Settings of a blind search (CLI options after parsing). */
export interface SearchSettings {
  readonly snrMin: number;
  readonly sizesArcmin: readonly number[] | null;
  readonly deproject: readonly string[];
  readonly dustBeta: number;
  readonly dustTempK: number;
  readonly apodisationArcmin: number;
  readonly iterations: number;
}

/** Parse `--deproject cmb,dust` into component names (lower case); BAD_OPTION on an unknown one. */
export function deprojectNames(list: string | undefined): string[] {
  if (list === undefined || list.trim() === "") return [];
  const names = list.split(",").map((s) => s.trim().toLowerCase()).filter((s) => s.length > 0);
  for (const n of names) if (n !== "cmb" && n !== "dust" && n !== "cib") throw new UmbraError("BAD_OPTION", `--deproject: unknown component '${n}' (use cmb, dust)`, { field: "deproject", value: n });
  return names;
}

/** SEDs (K_CMB per unit amplitude, per band) of deprojected components; dust/CIB: modified blackbody at 353 GHz. */
export function deprojectSedsFor(stack: BandStack, names: readonly string[], dustBeta: number, dustTempK: number): Float64Array[] {
  return names.map((n) => (n === "cmb" ? bandSed(stack, { kind: "cmb" }) : bandSed(stack, { kind: "dust", beta: dustBeta, temperatureK: dustTempK, refFrequencyGHz: 353 })));
}

/** A catalogue row as the estimators take it, with its 1-based CSV row number. */
export type CatalogueRow = CatalogueCluster & { readonly row: number };

/** Forced photometry of `rows` on `stack` with `s` (`seedOffset` is added to the random-position seed). */
export function measureStack(
  stack: BandStack,
  rows: readonly CatalogueCluster[],
  s: MeasureSettings,
  extra: { noiseCovariance?: MeasureOptions["noiseCovariance"]; seedOffset?: number; onProgress?: MeasureOptions["onProgress"]; fitRunner?: MeasureOptions["fitRunner"] } = {},
): { clusters: readonly ClusterMeasurement[]; diagnostics: MeasureResult["diagnostics"] | null } {
  const physics = clusterPhysics(s.cosmology, s.relation);
  const seed = s.seed + (extra.seedOffset ?? 0);
  if (s.method === "ilc") return { clusters: measureCatalogByIlc(stack, rows, { profile: a10ProfileShape(), physics, randomCount: s.randomCount, seed }).clusters, diagnostics: null };
  return measureClusters(stack, rows, {
    profile: a10ProfileShape(),
    seds: stackSedProvider(stack),
    physics,
    deproject: deprojectSedsFor(stack, s.deproject, s.dustBeta, s.dustTempK),
    fitKsz: s.ksz,
    relativistic: s.relativistic,
    ...(s.scanSizesArcmin === null ? {} : { scanSizesArcmin: s.scanSizesArcmin }),
    maxIterations: s.iterations,
    randomCount: s.randomCount,
    seed,
    apodisationArcmin: s.apodisationArcmin,
    ...(extra.noiseCovariance === undefined ? {} : { noiseCovariance: extra.noiseCovariance }),
    ...(extra.onProgress === undefined ? {} : { onProgress: extra.onProgress }),
    ...(extra.fitRunner === undefined ? {} : { fitRunner: extra.fitRunner }),
  });
}

/** Search options for `stack` from `s` (tSZ SED non-relativistic, A10 profile). */
export function searchOptionsFor(stack: BandStack, s: SearchSettings): SearchOptions {
  return {
    profile: a10ProfileShape(),
    tszSed: stackSedProvider(stack).tsz(0),
    snrMin: s.snrMin,
    deproject: deprojectSedsFor(stack, s.deproject, s.dustBeta, s.dustTempK),
    maxIterations: s.iterations,
    apodisationArcmin: s.apodisationArcmin,
    ...(s.sizesArcmin === null ? {} : { sizesArcmin: s.sizesArcmin }),
  };
}

/** Seed offset of tile `t`'s random positions (tiles draw independent positions; tile 0 uses the run's seed). */
export const TILE_SEED_STRIDE = 1_000_003;

/** The tiles of a stack for `tiling` (pixel size from the geometry). */
export function tilesOf(stack: BandStack, tiling: TilingOptions): SkyTile[] {
  const pixArcmin = Math.sqrt(stack.geometry.dxRad * stack.geometry.dyRad) / RAD_PER_ARCMIN;
  return planTiles(stack.nx, stack.ny, pixArcmin, tiling);
}

/** One tile of a measure run (what a worker thread needs; the stack is loaded from the manifest). */
export interface MeasureTileJob {
  readonly kind: "measure";
  readonly manifestPath: string;
  readonly tiling: TilingOptions;
  readonly tile: number;
  readonly settings: MeasureSettings;
  readonly rows: readonly CatalogueRow[];
}

/** One tile of a search run. */
export interface SearchTileJob {
  readonly kind: "search";
  readonly manifestPath: string;
  readonly tiling: TilingOptions;
  readonly tile: number;
  readonly settings: SearchSettings;
}

/** A tile job of either kind. */
export type TileJob = MeasureTileJob | SearchTileJob;
/** The result of a tile job. */
export type TileOutput = TileMeasurement<MeasureResult["diagnostics"] | null> | TileSearch;

/** Run one tile of `job` on `stack` (already loaded from `job.manifestPath`). */
export function runTileJob(stack: BandStack, job: TileJob): TileOutput {
  const tiles = tilesOf(stack, job.tiling);
  const tile = tiles[job.tile];
  if (tile === undefined) throw new UmbraError("BAD_OPTION", `tile ${job.tile} does not exist (the map has ${tiles.length} tiles)`, { field: "tile", value: job.tile });
  if (job.kind === "search") return searchTile(stack, tile, searchOptionsFor(stack, job.settings));
  const placement = placeClusters(stack, tiles, job.rows);
  return measureTile(stack, job.rows, placement, tile, (sub, subRows) => measureStack(sub, subRows, job.settings, { seedOffset: TILE_SEED_STRIDE * tile.index }));
}

let cachedStack: { path: string; stack: BandStack } | null = null;

/** Run a tile job, loading (and caching per thread) the band stack of its manifest. */
export async function runTileJobFromManifest(job: TileJob): Promise<TileOutput> {
  if (cachedStack === null || cachedStack.path !== job.manifestPath) cachedStack = { path: job.manifestPath, stack: await loadBandStack(job.manifestPath) };
  return runTileJob(cachedStack.stack, job);
}
