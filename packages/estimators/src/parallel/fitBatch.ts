/**
 * A batch of matched-filter fits on one bank: the same fits, in any order, on any number of
 * threads, give bit-identical results. The batch form every thread runs: task i = (θ, px, py,
 * SED set); results go into a flat array (status, amplitudes, covariance per task).
 */
import { UmbraError } from "@umbra/core";
import { combineSeds, createFitScratch, fitAtPosition, sedNodeTable, type ComponentFit, type FitBank } from "../mmf/fit.js";
import type { FilterBank } from "../mmf/bank.js";
import type { ProfileTable } from "../mmf/profile.js";
import type { SedFilter } from "../mmf/filteredMap.js";

/** One fit: the components' SEDs (with a key: same key ⇒ same SEDs), the profile scale and the pixel position (0-based). */
export interface FitRequest {
  readonly seds: readonly Float64Array[];
  readonly sedKey: string;
  readonly thetaRad: number;
  readonly px: number;
  readonly py: number;
}

/** One SED set of a batch: the SEDs, their whitened combination and Fisher node table on the batch's bank. */
export interface SedSet {
  readonly seds: readonly Float64Array[];
  readonly combined: readonly Float64Array[];
  readonly nodeTable: Float64Array;
}

/** Task status codes in {@link BatchArrays.status}. */
export const FIT_PENDING = 0;
export const FIT_OK = 1;
/** The Fisher matrix was singular (BAD_DATA from fitAtPosition): the caller gets null. */
export const FIT_SINGULAR = 2;
/** Any other failure (a bug): the caller raises INTERNAL. */
export const FIT_FAILED = 3;

/** The arrays a batch shares between threads (SharedArrayBuffer-backed when threads are used). */
export interface BatchArrays {
  /** [next task to take, tasks finished, tasks finished by worker threads]. */
  readonly control: Int32Array;
  /** Per task: θ (rad), px, py, SED-set index. */
  readonly tasks: Float64Array;
  /** Per task: status (see the FIT_* codes). */
  readonly status: Int32Array;
  /** Per task, `stride` numbers: nc amplitudes then nc × nc covariance. */
  readonly results: Float64Array;
  readonly stride: number;
}

/** The SED sets of `requests` on `bank` (one per key, in order of first use) and each request's set index. */
export function sedSets(bank: FilterBank, requests: readonly FitRequest[]): { sets: SedSet[]; index: Int32Array } {
  const byKey = new Map<string, number>();
  const sets: SedSet[] = [];
  const index = new Int32Array(requests.length);
  requests.forEach((r, i) => {
    let k = byKey.get(r.sedKey);
    if (k === undefined) {
      k = sets.length;
      byKey.set(r.sedKey, k);
      sets.push({ seds: r.seds, combined: combineSeds(bank, r.seds), nodeTable: sedNodeTable(bank, r.seds) });
    }
    index[i] = k;
  });
  return { sets, index };
}

/** Allocate a batch's arrays for `requests` (in SharedArrayBuffers when `shared`). */
export function batchArrays(requests: readonly FitRequest[], setIndex: Int32Array, shared: boolean): BatchArrays {
  const n = requests.length;
  const ncMax = Math.max(1, ...requests.map((r) => r.seds.length));
  const stride = ncMax + ncMax * ncMax;
  const buf = (bytes: number) => (shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes));
  const tasks = new Float64Array(buf(8 * 4 * n));
  requests.forEach((r, i) => tasks.set([r.thetaRad, r.px, r.py, setIndex[i] as number], 4 * i));
  return { control: new Int32Array(buf(12)), tasks, status: new Int32Array(buf(4 * n)), results: new Float64Array(buf(8 * stride * n)), stride };
}

/**
 * Take tasks from the batch until none is left (Atomics on the shared counters, so several threads
 * can run this at once) and fit each; returns how many this thread did.
 */
export function runBatchTasks(bank: FitBank, table: ProfileTable, sets: readonly SedSet[], a: BatchArrays, inWorker = false): number {
  const n = a.status.length;
  const scratch = createFitScratch(bank);
  let done = 0;
  for (;;) {
    const i = Atomics.add(a.control, 0, 1);
    if (i >= n) break;
    const set = sets[a.tasks[4 * i + 3] as number] as SedSet;
    let status = FIT_OK;
    try {
      const f = fitAtPosition(bank, table, a.tasks[4 * i] as number, set.seds, a.tasks[4 * i + 1] as number, a.tasks[4 * i + 2] as number, scratch, set.nodeTable, set.combined);
      a.results.set(f.amplitudes, i * a.stride);
      a.results.set(f.covariance, i * a.stride + f.amplitudes.length);
    } catch (e) {
      status = e instanceof UmbraError && e.code === "BAD_DATA" ? FIT_SINGULAR : FIT_FAILED;
    }
    Atomics.store(a.status, i, status);
    if (inWorker) Atomics.add(a.control, 2, 1);
    Atomics.add(a.control, 1, 1);
    Atomics.notify(a.control, 1);
    done++;
  }
  return done;
}

/** Read task i's fit from the batch arrays (null when singular; INTERNAL when it failed). */
export function batchResult(a: BatchArrays, i: number, nc: number): ComponentFit | null {
  const s = a.status[i];
  if (s === FIT_SINGULAR) return null;
  if (s !== FIT_OK) throw new UmbraError("INTERNAL", `matched-filter fit ${i} of a batch failed (status ${s})`);
  const o = i * a.stride;
  return { amplitudes: a.results.slice(o, o + nc), covariance: a.results.slice(o + nc, o + nc + nc * nc) };
}

/** The single-SED filter of a one-SED set (what filtered maps take). */
export function sedFilterOf(set: SedSet): SedFilter {
  return { sed: set.seds[0] as Float64Array, combined: set.combined[0] as Float64Array, nodeTable: set.nodeTable };
}
