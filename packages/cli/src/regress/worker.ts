/**
 * Worker thread of the regression pool: receives {scenarioPath, seed, snrMin, randomCount, runKey}
 * messages, simulates and measures one sky, posts back a RealisationResult (or an error message).
 */
import { loadScenario, simulateField } from "@umbra/simulate";
import { runRealisation } from "../commands/regress.js";
import type { RealisationResult } from "./types.js";
import { serveJobs } from "../pool.js";

/** A job for one realisation. */
export interface RealisationJob {
  scenarioPath: string;
  seed: number;
  snrMin: number;
  randomCount: number;
  runKey: string;
}

let cached: { path: string; loaded: Awaited<ReturnType<typeof loadScenario>> } | null = null;

/** Simulate and measure one realisation (also used in-process when no workers are asked for). */
export async function realisationResult(job: RealisationJob): Promise<RealisationResult> {
  if (cached === null || cached.path !== job.scenarioPath) cached = { path: job.scenarioPath, loaded: await loadScenario(job.scenarioPath) };
  const { scenario, cmbTable } = cached.loaded;
  const field = simulateField(scenario, job.seed, cmbTable === undefined ? {} : { cmbTable });
  const run = runRealisation(field, { snrMin: job.snrMin, randomCount: job.randomCount });
  return { seed: job.seed, runKey: job.runKey, record: run.record, randomScatter: run.forced.diagnostics.randomScatter, iterations: run.forced.diagnostics.iterations };
}

serveJobs(realisationResult);
