/**
 * `umbra search`: blind cluster search with the multi-frequency matched filter at a grid of sizes
 * (@umbra/estimators searchClusters). Candidates above `--snr-min` (raw S/N, maximised over
 * position and size) go to a CSV with raw and debiased S/N; `--snr-maps DIR` writes each size's
 * S/N map as FITS; `--json` writes diagnostics and provenance beside the CSV.
 */
import { mkdir } from "node:fs/promises";
import { join } from "node:path";
import type { Command } from "commander";
import { createFitPool, joinTileSearches, loadBandStack, searchClusters, type Candidate, type SkyTile, type TileSearch } from "@umbra/estimators";
import { UmbraError } from "@umbra/core";
import { resolve } from "node:path";
import { addTileOptions, parseTileOptions, type TileCliOptions } from "../tiles/options.js";
import { tileDirFor, type TileRun } from "../tiles/files.js";
import { deprojectNames, searchOptionsFor, tilesOf, type SearchSettings, type TileOutput } from "../tiles/jobs.js";
import { runTiles } from "../tiles/run.js";
import { stageProgress } from "../progress.js";
import { writeCsvAtomic, writeSkyMapFits, writeTextAtomic, type CsvValue } from "@umbra/maps";
import { VERSION } from "../version.js";
import { finishTiles, jsonPathFor, jsonSafe, numberOption, progress, runKeyOf, sizesOption } from "./measure.js";

interface SearchCliOptions extends TileCliOptions {
  bands: string;
  out: string;
  snrMin: string;
  sizes?: string;
  snrMaps?: string;
  deproject?: string;
  dustBeta: string;
  dustTemp: string;
  apodisation: string;
  iterations: string;
  json?: boolean;
}

/** CSV columns of the candidate list. */
export const SEARCH_COLUMNS = [
  "id", "ra_deg", "dec_deg", "pos_err_arcmin", "theta500_arcmin", "theta500_lo_arcmin", "theta500_hi_arcmin",
  "y0", "y0_err", "Y5R500_arcmin2", "Y5R500_err_arcmin2", "snr", "snr_debiased", "x_pix", "y_pix",
] as const;

function row(c: Candidate): Record<string, CsvValue> {
  return {
    id: c.id, ra_deg: c.raDeg, dec_deg: c.decDeg, pos_err_arcmin: c.positionErrArcmin,
    theta500_arcmin: c.theta500Arcmin, theta500_lo_arcmin: c.theta500LoArcmin, theta500_hi_arcmin: c.theta500HiArcmin,
    y0: c.y0, y0_err: c.y0Err, Y5R500_arcmin2: c.yArcmin2, Y5R500_err_arcmin2: c.yErrArcmin2,
    snr: c.snrRaw, snr_debiased: c.snrDebiased, x_pix: c.px, y_pix: c.py,
  };
}

/** Metadata of a search run that its outputs need (kept in every tile file). */
export interface SearchMeta {
  readonly inputs: readonly { path: string; sha256: string }[];
  readonly settings: Record<string, unknown>;
  readonly warnings: readonly string[];
  readonly tiles: readonly SkyTile[] | null;
}

/** Write CANDIDATES.csv (and .json with `json`) atomically: the same bytes for a tiled, sharded+merged or resumed run. */
async function writeSearchOutputs(out: string, json: boolean, meta: SearchMeta, candidates: readonly Candidate[], diagnostics: unknown, snrMin: number): Promise<void> {
  await writeCsvAtomic(out, SEARCH_COLUMNS, candidates.map(row));
  if (json) {
    const doc = {
      provenance: { tool: "umbra", version: VERSION, command: "search", inputs: meta.inputs, settings: meta.settings },
      warnings: meta.warnings,
      diagnostics,
      candidates,
    };
    await writeTextAtomic(jsonPathFor(out), `${JSON.stringify(doc, jsonSafe, 2)}\n`);
  }
  progress(`umbra search: ${candidates.length} candidates with raw S/N ≥ ${snrMin} written to ${out}`);
}

/** The outputs of a tiled search from its tile results: candidates of all tiles by raw S/N, per-tile diagnostics, total searched area. */
export async function writeTiledSearchOutputs(out: string, json: boolean, meta: SearchMeta, results: readonly TileOutput[]): Promise<void> {
  const parts = results as TileSearch[];
  const candidates = joinTileSearches(parts.length, parts);
  const tiles = meta.tiles ?? [];
  const diagnostics = {
    searchedAreaDeg2: parts.reduce((a, p) => a + (p.diagnostics?.searchedAreaDeg2 ?? 0), 0),
    thresholdUses: "raw",
    tiles: parts.map((p) => ({ tile: p.tile, core: tiles[p.tile]?.core, outer: tiles[p.tile]?.outer, candidates: p.candidates.length, noData: p.noData, ...p.diagnostics })),
  };
  await writeSearchOutputs(out, json, meta, candidates, diagnostics, Number(meta.settings["snrMin"]));
}

async function runSearch(o: SearchCliOptions): Promise<void> {
  const s: SearchSettings = {
    snrMin: numberOption("snr-min", o.snrMin, (v) => v > 0, "must be a positive S/N"),
    sizesArcmin: o.sizes === undefined ? null : sizesOption("sizes", o.sizes),
    deproject: deprojectNames(o.deproject),
    dustBeta: numberOption("dust-beta", o.dustBeta, (v) => v > -5 && v < 5, "must be a spectral index between -5 and 5"),
    dustTempK: numberOption("dust-temp", o.dustTemp, (v) => v > 0, "must be a positive temperature in K"),
    apodisationArcmin: numberOption("apodisation", o.apodisation, (v) => v >= 0, "must be ≥ 0 arcmin"),
    iterations: numberOption("iterations", o.iterations, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0"),
  };
  const { tiling, shard, workers, resume } = parseTileOptions(o);
  if (tiling !== null && o.snrMaps !== undefined) throw new UmbraError("BAD_OPTION", "--snr-maps is not supported with --tile (tiles overlap)", { field: "snr-maps" });
  progress(`umbra search: reading ${o.bands}`);
  const stack = await loadBandStack(o.bands);
  for (const w of stack.warnings) process.stderr.write(`umbra: warning: ${w}\n`);
  const settings = {
    profile: "gnfw-a10 (Arnaud et al. 2010), truncated at 5 R500", snrMin: s.snrMin, thresholdUses: "raw S/N (maximised over position and size)",
    debiasing: "sqrt(max(snr^2 - 3, 0)) (Vanderlinde et al. 2010)", sizesArcmin: s.sizesArcmin ?? "default (15 sizes, 0.5–10 arcmin)",
    deproject: s.deproject, dust: { beta: s.dustBeta, temperatureK: s.dustTempK, refFrequencyGHz: 353 }, apodisationArcmin: s.apodisationArcmin, cleaningIterations: s.iterations,
    ...(tiling === null ? {} : { tiles: { tileDeg: tiling.tileDeg, marginArcmin: tiling.marginArcmin } }),
  };
  if (tiling !== null) {
    const tiles = tilesOf(stack, tiling);
    const meta: SearchMeta = { inputs: stack.inputs, settings, warnings: stack.warnings, tiles };
    const runKey = runKeyOf("search", { settings, inputs: stack.inputs.map((i) => i.sha256), tiling });
    const run: TileRun = { command: "search", runKey, tileCount: tiles.length, meta: meta as unknown as Record<string, unknown> };
    const dir = tileDirFor(o.out);
    progress(`umbra search: ${stack.bands.length} bands ${stack.nx}×${stack.ny}, ${tiles.length} tiles${shard === null ? "" : ` (shard ${shard.index}/${shard.count})`}`);
    const done = await runTiles(stack, (t) => ({ kind: "search", manifestPath: resolve(o.bands), tiling, tile: t, settings: s }), { dir, run, shard, resume, workers, label: "search tiles" });
    await finishTiles(o.out, o.json === true, dir, shard, done, run);
    return;
  }
  const snrMaps: { theta: number; map: Float32Array }[] = [];
  const bars = stageProgress("umbra search");
  const fitRunner = createFitPool(Math.max(1, workers));
  let result: ReturnType<typeof searchClusters>;
  try {
    result = searchClusters(stack, {
      ...searchOptionsFor(stack, s),
      onProgress: bars.onProgress,
      fitRunner,
      ...(o.snrMaps === undefined ? {} : { onSnrMap: (theta: number, m: Float64Array) => snrMaps.push({ theta, map: Float32Array.from(m) }) }),
    });
  } finally {
    bars.stop();
    await fitRunner.close();
  }
  if (o.snrMaps !== undefined) {
    await mkdir(o.snrMaps, { recursive: true });
    for (const m of snrMaps) {
      const name = `snr_theta${m.theta.toFixed(3)}arcmin.fits`;
      await writeSkyMapFits(join(o.snrMaps, name), { data: Float64Array.from(m.map), nx: stack.nx, ny: stack.ny, wcs: stack.wcs }, {
        bitpix: -32,
        extname: "SNR",
        cards: [{ keyword: "THETA500", value: m.theta, comment: "filter size theta500 [arcmin]" }],
        provenance: { tool: "umbra", version: VERSION, settings: { command: "search", ...settings }, inputs: stack.inputs.map((i) => ({ file: i.path, sha256: i.sha256 })) },
      });
    }
  }
  await writeSearchOutputs(o.out, o.json === true, { inputs: stack.inputs, settings, warnings: stack.warnings, tiles: null }, result.candidates, result.diagnostics, s.snrMin);
}

/** Register `umbra search`. */
export function register(program: Command): void {
  const cmd = program
    .command("search")
    .description("Blind cluster search with the multi-frequency matched filter over a grid of sizes.")
    .requiredOption("--bands <manifest.json>", "band manifest (JSON; paths inside are relative to it)")
    .requiredOption("--out <candidates.csv>", "output CSV of candidates (written atomically)")
    .option("--snr-min <snr>", "threshold on the raw S/N (maximised over position and size)", "4.5")
    .option("--sizes <list>", "filter sizes theta500 in arcmin, comma-separated (default: 15 sizes log-spaced 0.5–10)")
    .option("--snr-maps <dir>", "write each size's S/N map as FITS into this folder")
    .option("--deproject <list>", "components to null in the filter, comma-separated: cmb, dust (default: none)")
    .option("--dust-beta <beta>", "dust SED spectral index for --deproject dust", "1.6")
    .option("--dust-temp <K>", "dust SED temperature in K for --deproject dust", "20")
    .option("--apodisation <arcmin>", "width of the edge taper in arcmin", "8")
    .option("--iterations <n>", "cleaning iterations: detections subtracted, covariance re-estimated", "2")
    .option("--json", "also write <out>.json with diagnostics and provenance");
  addTileOptions(cmd, "search", "CANDIDATES", "the filter sizes and candidate fits within the map").action(async (o: SearchCliOptions) => runSearch(o));
}
