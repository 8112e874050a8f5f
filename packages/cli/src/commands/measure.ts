/**
 * `umbra measure`: forced photometry of catalogued clusters with the multi-frequency matched
 * filter (@umbra/estimators measureClusters): y0, Y5R500 and their errors, S/N, flags; with
 * `--json` also the size scans, random-position errors, diagnostics and a provenance block.
 *
 * Contract: `umbra measure --bands BANDS.json --catalog CLUSTERS.csv --out RESULTS.csv
 * [--method mmf|ilc] [--json]`; RESULTS.csv starts with the columns
 * id,ra_deg,dec_deg,theta500_arcmin,y0,y0_err,Y5R500_arcmin2,Y5R500_err_arcmin2,snr,flags.
 */
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { resolve } from "node:path";
import type { Command } from "commander";
import { UmbraError } from "@umbra/core";
import {
  clusterPhysics,
  createFitPool,
  covarianceFromNoiseSimulations,
  joinTileMeasurements,
  loadBandStack,
  type ClusterMeasurement,
  type MeasureOptions,
  type MeasureResult,
  type SkyTile,
  type TileMeasurement,
  type TilingOptions,
} from "@umbra/estimators";
import { readClusterCatalog, writeCsvAtomic, writeTextAtomic, type CsvValue } from "@umbra/maps";
import { VERSION } from "../version.js";
import type { Shard } from "../shard.js";
import { addTileOptions, parseTileOptions, type TileCliOptions } from "../tiles/options.js";
import { collectTiles, readTileDirs, readTileFile, tileDirFor, type TileRun } from "../tiles/files.js";
import { deprojectNames, measureStack, tilesOf, TILE_SEED_STRIDE, type CatalogueRow, type MeasureSettings, type TileOutput } from "../tiles/jobs.js";
import { runTiles } from "../tiles/run.js";
import { stageProgress } from "../progress.js";
import { writeTiledSearchOutputs, type SearchMeta } from "./search.js";

/** Options as commander hands them over. */
interface MeasureCliOptions extends TileCliOptions {
  bands: string;
  catalog: string;
  out: string;
  method: string;
  json?: boolean;
  deproject?: string;
  dustBeta: string;
  dustTemp: string;
  ksz?: boolean;
  relativistic: boolean;
  randoms: string;
  seed: string;
  scanSizes?: string;
  apodisation: string;
  iterations: string;
  cosmology: string;
  relation: string;
  noiseSims?: string;
}

/** The required leading CSV columns (the pipeline contract). */
export const MEASURE_COLUMNS = ["id", "ra_deg", "dec_deg", "theta500_arcmin", "y0", "y0_err", "Y5R500_arcmin2", "Y5R500_err_arcmin2", "snr", "flags"] as const;
/** Further columns after the contract ones. */
export const MEASURE_EXTRA_COLUMNS = [
  "y0_err_random", "theta500_source", "te_kev_used", "v_los_kms", "v_los_err_kms",
  "Y5R500_mpc2", "Y5R500_err_mpc2", "m500_msun", "m500_err_msun", "x_pix", "y_pix",
] as const;

/** Parse a number option or throw BAD_OPTION naming it. */
export function numberOption(name: string, text: string, ok: (v: number) => boolean, why: string): number {
  const v = Number(text);
  if (text.trim() === "" || !Number.isFinite(v) || !ok(v)) throw new UmbraError("BAD_OPTION", `--${name} ${text}: ${why}`, { field: name, value: text });
  return v;
}

/** Parse a comma-separated list of positive numbers (arcmin). */
export function sizesOption(name: string, text: string): number[] {
  const parts = text.split(",").map((s) => s.trim()).filter((s) => s.length > 0);
  if (parts.length === 0) throw new UmbraError("BAD_OPTION", `--${name} needs a comma-separated list of sizes in arcmin`, { field: name });
  return parts.map((p) => numberOption(name, p, (v) => v > 0, "sizes must be positive numbers of arcmin"));
}

/** SHA-256 of a file, hex. */
export async function fileSha256(path: string): Promise<string> {
  return createHash("sha256").update(await readFile(path)).digest("hex");
}

/** The JSON path beside a CSV output: RESULTS.csv → RESULTS.json. */
export function jsonPathFor(out: string): string {
  return out.toLowerCase().endsWith(".csv") ? `${out.slice(0, -4)}.json` : `${out}.json`;
}

/** Print a line to stderr when it is a terminal (progress only). */
export function progress(line: string): void {
  if (process.stderr.isTTY) process.stderr.write(`${line}\n`);
}

function row(c: ClusterMeasurement): Record<string, CsvValue> {
  return {
    id: c.id, ra_deg: c.raDeg, dec_deg: c.decDeg, theta500_arcmin: c.theta500Arcmin,
    y0: c.y0, y0_err: c.y0Err, Y5R500_arcmin2: c.yArcmin2, Y5R500_err_arcmin2: c.yErrArcmin2, snr: c.snr,
    flags: c.flags.join("|"),
    y0_err_random: c.y0ErrRandom, theta500_source: c.thetaSource, te_kev_used: c.teKeVUsed,
    v_los_kms: c.vLosKms, v_los_err_kms: c.vLosErrKms, Y5R500_mpc2: c.yMpc2, Y5R500_err_mpc2: c.yErrMpc2,
    m500_msun: c.m500Msun, m500_err_msun: c.m500ErrMsun, x_pix: c.px, y_pix: c.py,
  };
}

/** JSON numbers: NaN/Infinity become null (JSON has no NaN). */
export function jsonSafe(_key: string, v: unknown): unknown {
  return typeof v === "number" && !Number.isFinite(v) ? null : v;
}

/** Parse the CLI options into plain settings (BAD_OPTION naming the first bad one). */
function measureSettings(o: MeasureCliOptions): MeasureSettings {
  if (o.method !== "mmf" && o.method !== "ilc") throw new UmbraError("BAD_OPTION", `--method ${o.method}: use mmf or ilc`, { field: "method", value: o.method });
  const s: MeasureSettings = {
    method: o.method,
    deproject: deprojectNames(o.deproject),
    dustBeta: numberOption("dust-beta", o.dustBeta, (v) => v > -5 && v < 5, "must be a spectral index between -5 and 5"),
    dustTempK: numberOption("dust-temp", o.dustTemp, (v) => v > 0, "must be a positive temperature in K"),
    ksz: o.ksz === true,
    relativistic: o.relativistic,
    randomCount: numberOption("randoms", o.randoms, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0"),
    seed: numberOption("seed", o.seed, Number.isInteger, "must be an integer"),
    scanSizesArcmin: o.scanSizes === undefined ? null : sizesOption("scan-sizes", o.scanSizes),
    apodisationArcmin: numberOption("apodisation", o.apodisation, (v) => v >= 0, "must be ≥ 0 arcmin"),
    iterations: numberOption("iterations", o.iterations, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0"),
    cosmology: o.cosmology,
    relation: o.relation,
  };
  clusterPhysics(s.cosmology, s.relation); // unknown names fail here, before any heavy work
  if (s.ksz && s.deproject.includes("cmb")) {
    throw new UmbraError("BAD_OPTION", "--ksz with --deproject cmb: the kSZ has the CMB's spectrum, so it would be deprojected too", { field: "ksz" });
  }
  if (s.method === "ilc" && (s.deproject.length > 0 || s.ksz)) {
    throw new UmbraError("BAD_OPTION", "--method ilc takes no --deproject or --ksz here (use umbra ymap for constrained ILC maps, or --method mmf)", { field: "method" });
  }
  return s;
}

/** The provenance settings block of a measure run. */
function settingsBlock(s: MeasureSettings, simPaths: readonly string[], tiling: TilingOptions | null): Record<string, unknown> {
  return {
    method: s.method === "ilc" ? "ilc (scale-dependent ILC y map + aperture photometry, @umbra/estimators aperture/)" : "mmf", profile: "gnfw-a10 (Arnaud et al. 2010), truncated at 5 R500", deproject: s.deproject,
    dust: { beta: s.dustBeta, temperatureK: s.dustTempK, refFrequencyGHz: 353 }, ksz: s.ksz, relativistic: s.relativistic,
    randoms: s.randomCount, seed: s.seed, scanSizesArcmin: s.scanSizesArcmin ?? "default (15 sizes, 0.5–10 arcmin)", apodisationArcmin: s.apodisationArcmin,
    cleaningIterations: s.iterations, cosmology: s.cosmology, relation: s.relation, noiseSimulations: simPaths,
    ...(tiling === null ? {} : { tiles: { tileDeg: tiling.tileDeg, marginArcmin: tiling.marginArcmin, randomSeed: `seed + ${TILE_SEED_STRIDE} × tile index` } }),
  };
}

/** Metadata of a measure run that its outputs need (kept in every tile file). */
interface MeasureMeta {
  readonly inputs: readonly { path: string; sha256: string }[];
  readonly settings: Record<string, unknown>;
  readonly warnings: readonly string[];
  readonly catalogProblems: readonly unknown[];
  readonly rowCount: number;
  readonly tiles: readonly SkyTile[] | null;
}

/** Write RESULTS.csv (and RESULTS.json with `json`) atomically: the same bytes for a single, tiled or merged run. */
export async function writeMeasureOutputs(out: string, json: boolean, meta: MeasureMeta, clusters: readonly ClusterMeasurement[], diagnostics: unknown): Promise<void> {
  await writeCsvAtomic(out, [...MEASURE_COLUMNS, ...MEASURE_EXTRA_COLUMNS], clusters.map(row));
  if (json) {
    const doc = {
      provenance: { tool: "umbra", version: VERSION, command: "measure", inputs: meta.inputs, settings: meta.settings },
      warnings: meta.warnings,
      catalogProblems: meta.catalogProblems,
      diagnostics,
      clusters,
    };
    await writeTextAtomic(jsonPathFor(out), `${JSON.stringify(doc, jsonSafe, 2)}\n`);
  }
  const ok = clusters.filter((c) => Number.isFinite(c.y0)).length;
  progress(`umbra measure: wrote ${out} (${ok} of ${clusters.length} clusters measured)`);
}

/** The outputs of a tiled measure run from its tile results (catalogue order; per-tile diagnostics). */
export async function writeTiledMeasureOutputs(out: string, json: boolean, meta: MeasureMeta, results: readonly TileOutput[]): Promise<void> {
  const parts = results as TileMeasurement<MeasureResult["diagnostics"] | null>[];
  const clusters = joinTileMeasurements(meta.rowCount, parts);
  const tiles = meta.tiles ?? [];
  const diagnostics = { tiles: parts.map((p) => ({ tile: p.tile, core: tiles[p.tile]?.core, outer: tiles[p.tile]?.outer, clusters: p.rows.length, noData: p.noData, ...p.diagnostics })) };
  await writeMeasureOutputs(out, json, meta, clusters, diagnostics);
}

async function runMeasure(o: MeasureCliOptions): Promise<void> {
  const s = measureSettings(o);
  const { tiling, shard, workers, resume } = parseTileOptions(o);
  progress(`umbra measure: reading ${o.bands}`);
  const stack = await loadBandStack(o.bands);
  for (const w of stack.warnings) process.stderr.write(`umbra: warning: ${w}\n`);
  const catalog = await readClusterCatalog(o.catalog);
  for (const p of catalog.problems) process.stderr.write(`umbra: warning: ${o.catalog}, row ${p.row}, column '${p.column}': ${p.message} (row skipped)\n`);
  let noiseCovariance: MeasureOptions["noiseCovariance"];
  const simInputs: { path: string; sha256: string }[] = [];
  const simPaths = (o.noiseSims ?? "").split(",").map((x) => x.trim()).filter((x) => x.length > 0);
  if (simPaths.length > 0 && tiling !== null) throw new UmbraError("BAD_OPTION", "--noise-sims is not supported with --tile (the simulations' covariance is for the whole map)", { field: "noise-sims" });
  if (simPaths.length > 0) {
    const sims = [];
    for (const p of simPaths) {
      const sim = await loadBandStack(p);
      simInputs.push(...sim.inputs);
      sims.push(sim);
    }
    noiseCovariance = covarianceFromNoiseSimulations(sims, { apodisationArcmin: s.apodisationArcmin });
  }
  const rows: CatalogueRow[] = catalog.rows.map((r, k) => ({ id: r.id, raDeg: r.raDeg, decDeg: r.decDeg, theta500Arcmin: r.theta500Arcmin, z: r.z, m500Msun: r.m500Msun, teKeV: r.teKeV, row: k + 1 }));
  const inputs = [...stack.inputs, { path: resolve(o.catalog), sha256: await fileSha256(o.catalog) }, ...simInputs];
  const meta0 = { inputs, settings: settingsBlock(s, simPaths, tiling), warnings: stack.warnings, catalogProblems: catalog.problems, rowCount: rows.length };
  if (tiling === null) {
    progress(`umbra measure: ${rows.length} clusters, ${stack.bands.length} bands ${stack.nx}×${stack.ny}`);
    const bars = stageProgress("umbra measure");
    const fitRunner = createFitPool(Math.max(1, workers));
    let result: ReturnType<typeof measureStack>;
    try {
      result = measureStack(stack, rows, s, { ...(noiseCovariance === undefined ? {} : { noiseCovariance }), onProgress: bars.onProgress, fitRunner });
    } finally {
      bars.stop();
      await fitRunner.close();
    }
    await writeMeasureOutputs(o.out, o.json === true, { ...meta0, tiles: null }, result.clusters, result.diagnostics);
    return;
  }
  const tiles = tilesOf(stack, tiling);
  const meta: MeasureMeta = { ...meta0, tiles };
  const runKey = runKeyOf("measure", { settings: meta.settings, inputs: inputs.map((i) => i.sha256), tiling, rows: rows.length });
  const run: TileRun = { command: "measure", runKey, tileCount: tiles.length, meta: meta as unknown as Record<string, unknown> };
  const dir = tileDirFor(o.out);
  progress(`umbra measure: ${rows.length} clusters, ${stack.bands.length} bands ${stack.nx}×${stack.ny}, ${tiles.length} tiles${shard === null ? "" : ` (shard ${shard.index}/${shard.count})`}`);
  const done = await runTiles(stack, (t) => ({ kind: "measure", manifestPath: resolve(o.bands), tiling, tile: t, settings: s, rows }), { dir, run, shard, resume, workers, label: "measure tiles" });
  await finishTiles(o.out, o.json === true, dir, shard, done, run);
}

/** After a tiled run: a sharded one says what it wrote; a whole one writes the outputs from the tile files. */
export async function finishTiles(out: string, json: boolean, dir: string, shard: Shard | null, done: { computed: number; skipped: number; owned: number[] }, run: TileRun): Promise<void> {
  if (shard !== null && shard.count > 1) {
    process.stderr.write(`umbra ${run.command}: shard ${shard.index}/${shard.count}: tiles ${done.owned.length === 0 ? "none" : `${done.owned[0]}–${done.owned[done.owned.length - 1]}`} in ${dir} (${done.computed} computed, ${done.skipped} already there); when every shard is done, join them with: umbra merge --out ${out} ${dir} [the other shards' tile folders, if not this one]\n`);
    return;
  }
  // this run's tiles only: files of an earlier run with other settings may share the folder
  const results = [];
  for (let t = 0; t < run.tileCount; t++) {
    const f = await readTileFile(dir, t);
    if (f === null || f.run.runKey !== run.runKey) throw new UmbraError("NOT_FOUND", `tile ${t} of this run is missing from ${dir}`, { file: dir });
    results.push(f.result);
  }
  await writeTiledOutputs(out, json, run, results);
}

/** Write the final outputs of a tiled measure or search run from its tile results (tile order). */
async function writeTiledOutputs(out: string, json: boolean, run: TileRun, results: readonly TileOutput[]): Promise<void> {
  if (run.command === "measure") await writeTiledMeasureOutputs(out, json, run.meta as unknown as MeasureMeta, results);
  else await writeTiledSearchOutputs(out, json, run.meta as unknown as SearchMeta, results);
}

/** Write the final outputs of a tiled run from the tile files in `dirs` (also `umbra merge`). */
export async function writeFromTileDirs(out: string, json: boolean, dirs: readonly string[]): Promise<void> {
  const { run, results } = collectTiles(await readTileDirs(dirs));
  await writeTiledOutputs(out, json, run, results);
}

/** The run key: SHA-256 of the command, version and everything that decides the results. */
export function runKeyOf(command: string, what: unknown): string {
  return createHash("sha256").update(JSON.stringify({ command, version: VERSION, what })).digest("hex");
}

/** Register `umbra measure`. */
export function register(program: Command): void {
  const cmd = program
    .command("measure")
    .description("Forced photometry of catalogued clusters with the multi-frequency matched filter: y0, Y5R500, errors, S/N.")
    .requiredOption("--bands <manifest.json>", "band manifest (JSON; paths inside are relative to it)")
    .requiredOption("--catalog <clusters.csv>", "cluster catalogue CSV: id,ra_deg,dec_deg required; theta500_arcmin, z, m500_msun, te_kev optional")
    .requiredOption("--out <results.csv>", "output CSV (written atomically)")
    .option("--method <mmf|ilc>", "estimator: mmf (matched multi-frequency filter) or ilc", "mmf")
    .option("--json", "also write <out>.json with size scans, random-position errors, diagnostics and provenance")
    .option("--deproject <list>", "components to null in the filter, comma-separated: cmb, dust (default: none)")
    .option("--dust-beta <beta>", "dust SED spectral index for --deproject dust", "1.6")
    .option("--dust-temp <K>", "dust SED temperature in K for --deproject dust", "20")
    .option("--ksz", "fit kSZ jointly with tSZ and report the line-of-sight velocity (km/s; needs te_kev or z+m500)")
    .option("--no-relativistic", "use the non-relativistic tSZ spectrum even when te_kev or z+m500 are given")
    .option("--randoms <n>", "random positions for the empirical error (0 = none)", "300")
    .option("--seed <n>", "seed of the random positions", "1")
    .option("--scan-sizes <list>", "theta500 values in arcmin scanned when a cluster has none (default: 15 sizes 0.5–10)")
    .option("--apodisation <arcmin>", "width of the edge taper in arcmin", "8")
    .option("--iterations <n>", "cluster-cleaning iterations of the noise covariance", "4")
    .option("--cosmology <name>", "cosmology preset for theta500(M, z), D_A and masses", "cmb2018")
    .option("--relation <name>", "Y–M relation for M500: a10 or planck2014", "a10")
    .option("--noise-sims <manifests>", "comma-separated band manifests of noise-only simulations: their mean covariance replaces the data estimate");
  addTileOptions(cmd, "measure", "RESULTS", "the cluster fits within the map").action(async (o: MeasureCliOptions) => runMeasure(o));
}
