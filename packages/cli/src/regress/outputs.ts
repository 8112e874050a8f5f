/**
 * The files of a regression run. Every realisation is written on its own, atomically, as
 * `realisations/seed-<seed>.json` the moment it finishes (so an interrupted run loses at most the
 * realisations in flight, `--resume` skips the finished ones, and shards are plain folders of
 * realisations); the summary and report are computed from the set of realisations sorted by seed,
 * so a single run, a resumed run, a pool of workers and merged shards all write identical files.
 */
import { mkdir, readdir, readFile } from "node:fs/promises";
import { join } from "node:path";
import { UmbraError } from "@umbra/core";
import { sha256Hex, stableJson, writeFileAtomic } from "@umbra/maps";
import { regressionSummary, type RegressionSummary } from "@umbra/simulate";
import { completenessFigure, pullHistogram, purityFigure, yBiasFigure, yMeasuredVsTrue } from "../report/figures.js";
import { writeReport } from "../report/write.js";
import { VERSION } from "../version.js";
import type { RealisationResult, RegressSettings } from "./types.js";

/** The scenario a run used: path as given (resolved) and SHA-256 of its bytes. */
export interface ScenarioRef {
  path: string;
  sha256: string;
}

/** A realisation file's contents. */
interface RealisationFile extends RealisationResult {
  scenario: ScenarioRef;
  settings: RegressSettings;
}

/** Key identifying a run's scenario and settings; realisations are reused or merged only when it matches. */
export function runKeyOf(scenario: ScenarioRef, settings: RegressSettings): string {
  return sha256Hex(stableJson({ scenarioSha256: scenario.sha256, settings }));
}

function realisationName(seed: number): string {
  return `seed-${String(seed)}.json`;
}

/** Write one realisation atomically under `dir/realisations/`. */
export async function writeRealisation(dir: string, scenario: ScenarioRef, settings: RegressSettings, r: RealisationResult): Promise<void> {
  const folder = join(dir, "realisations");
  await mkdir(folder, { recursive: true });
  const body: RealisationFile = { ...r, scenario, settings };
  await writeFileAtomic(join(folder, realisationName(r.seed)), `${JSON.stringify(body, jsonNumbers, 1)}\n`);
}

/** JSON has no NaN: write non-finite numbers as null. */
function jsonNumbers(_k: string, v: unknown): unknown {
  return typeof v === "number" && !Number.isFinite(v) ? null : v;
}

/** Realisation files found in `dirs` (each a run or shard output folder), keyed by seed. */
export async function readRealisations(dirs: readonly string[]): Promise<Map<number, RealisationFile & { file: string }>> {
  const out = new Map<number, RealisationFile & { file: string }>();
  for (const d of dirs) {
    const folder = join(d, "realisations");
    let names: string[];
    try {
      names = (await readdir(folder)).filter((n) => /^seed-(-?\d+)\.json$/.test(n));
    } catch {
      continue;
    }
    for (const n of names) {
      const file = join(folder, n);
      let parsed: RealisationFile;
      try {
        parsed = JSON.parse(await readFile(file, "utf8")) as RealisationFile;
      } catch (e) {
        throw new UmbraError("BAD_DATA", `not a readable realisation file: ${(e as Error).message}`, { file });
      }
      const prev = out.get(parsed.seed);
      if (prev !== undefined && prev.runKey !== parsed.runKey) {
        throw new UmbraError("BAD_DATA", `seed ${parsed.seed} appears in two runs with different scenarios or settings (${prev.file})`, { file });
      }
      out.set(parsed.seed, { ...parsed, file });
    }
  }
  return out;
}

/** Restore NaN where JSON stored null in a record (errors and values of unmeasured clusters). */
function restoreRecord(r: RealisationResult): RealisationResult {
  const n = (v: number | null): number => (v === null ? Number.NaN : v);
  return {
    ...r,
    record: {
      ...r.record,
      truth: r.record.truth.map((t) => ({ ...t, yArcmin2: n(t.yArcmin2), snrTrue: n(t.snrTrue) })),
      forced: r.record.forced.map((f) => ({ ...f, yArcmin2: n(f.yArcmin2), yErrArcmin2: n(f.yErrArcmin2) })),
      detections: r.record.detections.map((d) => ({ ...d, snr: n(d.snr) })),
    },
  };
}

/**
 * Write `summary.json` (provenance, summary, per-realisation random-position checks) and the HTML
 * report into `dir` from the realisations (any order; sorted by seed here). Every seed
 * firstSeed … firstSeed + realisations − 1 must be present exactly once.
 */
export async function writeRegressOutputs(dir: string, scenario: ScenarioRef, settings: RegressSettings, results: readonly RealisationResult[]): Promise<RegressionSummary> {
  const sorted = [...results].map(restoreRecord).sort((a, b) => a.seed - b.seed);
  const missing: number[] = [];
  for (let s = settings.firstSeed; s < settings.firstSeed + settings.realisations; s++) if (!sorted.some((r) => r.seed === s)) missing.push(s);
  if (missing.length > 0 || sorted.length !== settings.realisations) {
    throw new UmbraError("BAD_DATA", `a regression summary needs seeds ${settings.firstSeed}…${settings.firstSeed + settings.realisations - 1}; missing: ${missing.slice(0, 20).join(", ") || "none"}, found ${sorted.length}`, { field: "realisations" });
  }
  const summary = regressionSummary(sorted.map((r) => r.record));
  const doc = {
    provenance: { tool: "umbra", version: VERSION, command: "regress", inputs: [{ path: scenario.path, sha256: scenario.sha256 }], settings },
    summary,
    randomPositionChecks: sorted.map((r) => ({ seed: r.seed, randomScatter: r.randomScatter, iterations: r.iterations })),
  };
  await mkdir(dir, { recursive: true });
  await writeFileAtomic(join(dir, "summary.json"), `${JSON.stringify(doc, jsonNumbers, 2)}\n`);
  const records = sorted.map((r) => r.record);
  const s = summary;
  await writeReport(join(dir, "report"), `umbra regression: ${settings.realisations} realisations`, [
    {
      kind: "paragraph",
      text: `Scenario ${scenario.path} (SHA-256 ${scenario.sha256.slice(0, 12)}…), seeds ${settings.firstSeed}–${settings.firstSeed + settings.realisations - 1}; forced photometry at the true positions and sizes (matched filter, ${settings.profile}) and a blind search (raw S/N ≥ ${settings.snrMin}). These are statistics of simulated skies, with their statistical errors.`,
    },
    {
      kind: "table",
      columns: ["quantity", "value", "error"],
      rows: [
        ["clusters (all realisations)", s.clustersTotal, ""],
        ["pull mean", s.pulls.mean.value, s.pulls.mean.error],
        ["pull standard deviation", s.pulls.std.value, s.pulls.std.error],
        ["median position error [arcmin]", s.position.medianArcmin.value, s.position.medianArcmin.error],
        ["detections (all realisations)", s.detectionsTotal, ""],
      ],
    },
    { kind: "figure", figure: yMeasuredVsTrue(records) },
    { kind: "figure", figure: pullHistogram(records, s) },
    { kind: "figure", figure: yBiasFigure(s) },
    { kind: "figure", figure: completenessFigure(s) },
    { kind: "figure", figure: purityFigure(s) },
  ]);
  return summary;
}
