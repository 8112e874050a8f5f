/**
 * `umbra regress`: simulate N skies of a scenario (@umbra/simulate), run forced photometry at the
 * true positions and sizes and a blind search on each, and summarise bias, pulls, completeness,
 * purity and positions with @umbra/simulate's regression statistics (JSON + HTML/SVG report).
 * Also exports the pieces the regression tests use.
 */
import { mkdir } from "node:fs/promises";
import { join, resolve } from "node:path";
import type { Command } from "commander";
import {
  a10ProfileShape,
  measureClusters,
  searchClusters,
  stackSedProvider,
  type BandStack,
  type MeasureResult,
  type SearchResult,
} from "@umbra/estimators";
import { gaussianBeam } from "@umbra/maps";
import { loadScenario, type RealisationRecord, type SimulatedField } from "@umbra/simulate";
import { fileSha256, numberOption, progress } from "./measure.js";
import { parseShard, shardRange } from "../shard.js";
import { progressBar } from "../progress.js";
import { runPool } from "../pool.js";
import { realisationResult, type RealisationJob } from "../regress/worker.js";
import { readRealisations, runKeyOf, writeRealisation, writeRegressOutputs, type ScenarioRef } from "../regress/outputs.js";
import type { RealisationResult, RegressSettings } from "../regress/types.js";

/** The simulated field as a band stack in K_CMB (the maps divided by their K_CMB→unit factor). */
export function stackFromSimulatedField(field: SimulatedField): BandStack {
  const bands = field.bands.map((b) => {
    const beam = gaussianBeam(b.beamFwhmArcmin);
    const k = b.kcmbToUnit;
    return {
      name: b.name,
      spectral: b.band,
      beam: (ells: Float64Array) => beam.transferOnEll(ells),
      beamFwhmArcmin: b.beamFwhmArcmin,
      data: Float64Array.from(b.map, (v) => v / k),
      ivar: b.ivar === null ? null : Float64Array.from(b.ivar, (v) => v * k * k),
      mask: null,
    };
  });
  return { nx: field.geometry.nx, ny: field.geometry.ny, geometry: field.geometry, wcs: field.wcs, bands, warnings: [], inputs: [] };
}

/** One realisation: forced photometry at the truth and a blind search. */
export interface RealisationRun {
  readonly field: SimulatedField;
  readonly forced: MeasureResult;
  readonly search: SearchResult | null;
  readonly record: RealisationRecord;
}

/** Options of {@link runRealisation}. */
export interface RealisationOptions {
  /** Pass the simulated ivar maps on (default true). */
  readonly useIvar?: boolean;
  readonly search?: boolean;
  readonly snrMin?: number;
  readonly searchSizesArcmin?: readonly number[];
  readonly randomCount?: number;
  readonly maxIterations?: number;
}

/** Simulate one sky and measure it (see module doc). Clusters near the edge or off the field are left out. */
export function runRealisation(field: SimulatedField, opts: RealisationOptions = {}): RealisationRun {
  const full = stackFromSimulatedField(field);
  const stack = opts.useIvar === false ? { ...full, bands: full.bands.map((b) => ({ ...b, ivar: null })) } : full;
  // every cluster in the field is passed on (the ones near the edge are fitted for the covariance
  // cleaning and come back flagged); the statistics use those away from the edge
  const truth = field.clusters.filter((c) => c.inField && !c.nearEdge);
  // measured with the tSZ spectrum the sky was painted with: relativistic at each cluster's true kTe
  // when the scenario asks for it, non-relativistic otherwise
  const relativistic = field.scenario.sky.clusters?.relativistic === true;
  const forced = measureClusters(
    stack,
    field.clusters.filter((c) => c.inField).map((c) => ({ id: c.id, raDeg: c.raDeg, decDeg: c.decDeg, theta500Arcmin: c.theta500Arcmin, teKeV: relativistic ? c.kTeKeV : null, z: null, m500Msun: null })),
    { profile: a10ProfileShape(), seds: stackSedProvider(stack), relativistic, randomCount: opts.randomCount ?? 200, maxIterations: opts.maxIterations ?? 4 },
  );
  const search = opts.search === false
    ? null
    : searchClusters(stack, {
        profile: a10ProfileShape(),
        tszSed: stackSedProvider(stack).tsz(0),
        snrMin: opts.snrMin ?? 4,
        ...(opts.searchSizesArcmin === undefined ? {} : { sizesArcmin: opts.searchSizesArcmin }),
      });
  const byId = new Map(forced.clusters.map((c) => [c.id, c]));
  const recordTruth = truth.flatMap((c) => {
    const m = byId.get(c.id);
    if (m === undefined || !Number.isFinite(m.yErrArcmin2)) return [];
    return [{ id: c.id, raDeg: c.raDeg, decDeg: c.decDeg, yArcmin2: c.y5r500Arcmin2, snrTrue: c.y5r500Arcmin2 / m.yErrArcmin2 }];
  });
  const record: RealisationRecord = {
    seed: field.seed,
    truth: recordTruth,
    forced: forced.clusters.filter((c) => Number.isFinite(c.yArcmin2) && truth.some((t) => t.id === c.id)).map((c) => ({ id: c.id, yArcmin2: c.yArcmin2, yErrArcmin2: c.yErrArcmin2 })),
    // a detection of a real cluster left out of the statistics (near the edge, or flagged in the
    // forced photometry) is neither a false candidate nor a found one: drop it
    detections: (search?.candidates ?? [])
      .filter((d) => {
        const cosDec = Math.cos((d.decDeg * Math.PI) / 180);
        const near = (c: { raDeg: number; decDeg: number }) => Math.hypot((d.raDeg - c.raDeg) * cosDec, d.decDeg - c.decDeg) * 60 <= 2;
        const counted = new Set(recordTruth.map((t) => t.id));
        return !field.clusters.some((c) => !counted.has(c.id) && near(c)) || recordTruth.some((t) => near(t));
      })
      .map((d) => ({ raDeg: d.raDeg, decDeg: d.decDeg, snr: d.snrRaw })),
  };
  return { field, forced, search, record };
}

interface RegressCliOptions {
  scenario: string;
  realisations: string;
  out: string;
  seed: string;
  snrMin: string;
  randoms: string;
  shard?: string;
  workers: string;
  resume?: boolean;
}

async function runRegress(o: RegressCliOptions): Promise<void> {
  const n = numberOption("realisations", o.realisations, (v) => Number.isInteger(v) && v >= 1, "must be an integer ≥ 1");
  const seed0 = numberOption("seed", o.seed, Number.isInteger, "must be an integer");
  const snrMin = numberOption("snr-min", o.snrMin, (v) => v > 0, "must be > 0");
  const randomCount = numberOption("randoms", o.randoms, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0");
  const workers = numberOption("workers", o.workers, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0 (0: run in this thread)");
  const shard = o.shard === undefined ? null : parseShard(o.shard);
  await loadScenario(o.scenario); // validate before any work; workers load it again
  const scenarioPath = resolve(o.scenario);
  const scenario: ScenarioRef = { path: scenarioPath, sha256: await fileSha256(o.scenario) };
  const settings: RegressSettings = { realisations: n, firstSeed: seed0, snrMin, randoms: randomCount, profile: "gnfw-a10", filter: "mmf" };
  const runKey = runKeyOf(scenario, settings);
  await mkdir(o.out, { recursive: true });
  const { start, end } = shard === null ? { start: 0, end: n } : shardRange(n, shard);
  const done = o.resume === true ? await readRealisations([o.out]) : new Map<number, RealisationResult>();
  const results: RealisationResult[] = [];
  const jobs: RealisationJob[] = [];
  for (let r = start; r < end; r++) {
    const seed = seed0 + r;
    const prev = done.get(seed);
    if (prev !== undefined && prev.runKey === runKey) results.push(prev);
    else jobs.push({ scenarioPath, seed, snrMin, randomCount, runKey });
  }
  if (results.length > 0) progress(`umbra regress: resuming, ${results.length} realisation(s) already done`);
  let finished = results.length;
  const total = end - start;
  const bar = progressBar("umbra regress: realisations", total, finished);
  const keep = async (res: RealisationResult): Promise<void> => {
    await writeRealisation(o.out, scenario, settings, res);
    results.push(res);
    finished++;
    bar.update(finished);
  };
  try {
    if (workers > 0) await runPool(new URL("../regress/worker.ts", import.meta.url), jobs, workers, (j) => `realisation seed ${j.seed}`, keep);
    else for (const job of jobs) await keep(await realisationResult(job));
  } finally {
    bar.stop();
  }
  if (shard !== null) {
    progress(`umbra regress: shard ${shard.index}/${shard.count} wrote ${total} realisation(s) to ${join(o.out, "realisations")}; join the shards with umbra merge`);
    return;
  }
  await writeRegressOutputs(o.out, scenario, settings, results);
  progress(`umbra regress: wrote ${join(o.out, "summary.json")} and ${join(o.out, "report", "index.html")}`);
}

/** Register `umbra regress`. */
export function register(program: Command): void {
  program
    .command("regress")
    .description("Simulate skies of a scenario, run forced photometry and blind search, and report bias, pulls, completeness and purity.")
    .requiredOption("--scenario <scenario.json>", "simulation scenario (JSON, see @umbra/simulate)")
    .requiredOption("--realisations <n>", "number of simulated skies")
    .requiredOption("--out <dir>", "output folder: realisations/seed-<n>.json, summary.json and report/index.html")
    .option("--seed <n>", "seed of the first realisation (realisation r uses seed + r)", "1")
    .option("--snr-min <snr>", "raw S/N threshold of the blind search", "4")
    .option("--randoms <n>", "random positions for the empirical error per realisation", "200")
    .option("--shard <i/N>", "run only the i-th of N contiguous blocks of realisations (1-based; join the shards' folders with umbra merge)")
    .option("--workers <n>", "worker threads, one realisation each at a time (0: this thread)", "0")
    .option("--resume", "reuse realisations already in <out>/realisations made with the same scenario and settings")
    .action(async (o: RegressCliOptions) => runRegress(o));
}

