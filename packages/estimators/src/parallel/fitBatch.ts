/**
 * A batch of matched-filter fits on one bank: the same fits, in any order, on any number of
 * threads, give bit-identical results. The batch form every thread runs: task i = (θ, px, py,
 * SED set); results go into a flat array (status, amplitudes, covariance per task). Fits at the same
 * position with the same SEDs (a size scan, the re-fits of a candidate at every size) form one group,
 * taken by one thread: one pass over the modes for the position's rings, then one pass over the
 * rings per size (../mmf/fit.ts).
 */
import { takeItems } from "./counter.js";
import { UmbraError } from "@umbra/core";
import { combineSeds, createFitScratch, fitFromRings, positionRings, sedNodeTable, type ComponentFit, type FitBank } from "../mmf/fit.js";
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
  /** [next group to take, tasks finished, tasks finished by worker threads]. */
  readonly control: Int32Array;
  /** Task indices grouped by position and SED set (groups in order of first task). */
  readonly groupTasks: Int32Array;
  /** Start of each group in groupTasks, and the end (length groups + 1). */
  readonly groupStart: Int32Array;
  /** Per task: θ (rad), px, py, SED-set index. */
  readonly tasks: Float64Array;
  /** Per task: status (see the FIT_* codes). */
  readonly status: Int32Array;
  /** Per task, `stride` numbers: nc amplitudes then nc × nc covariance. */
  readonly results: Float64Array;
  readonly stride: number;
}

/** The SED sets of `requests` on `bank` (one per key, in order of first use) and each request's set index. */
export function sedSets(bank: FilterBank, requests: readonly Pick<FitRequest, "seds" | "sedKey">[]): { sets: SedSet[]; index: Int32Array } {
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
  const groups = new Map<string, number[]>();
  requests.forEach((r, i) => {
    const key = `${setIndex[i] as number} ${r.px} ${r.py}`;
    const g = groups.get(key);
    if (g === undefined) groups.set(key, [i]);
    else g.push(i);
  });
  const groupTasks = new Int32Array(buf(4 * n));
  const groupStart = new Int32Array(buf(4 * (groups.size + 1)));
  let o = 0;
  let k = 0;
  for (const members of groups.values()) {
    groupStart[k++] = o;
    for (const i of members) groupTasks[o++] = i;
  }
  groupStart[k] = o;
  return { control: new Int32Array(buf(12)), groupTasks, groupStart, tasks, status: new Int32Array(buf(4 * n)), results: new Float64Array(buf(8 * stride * n)), stride };
}

/**
 * Take groups of tasks from the batch until none is left (Atomics on the shared counters, so several
 * threads can run this at once) and fit each task; returns how many tasks this thread did.
 */
export function runBatchTasks(bank: FitBank, table: ProfileTable, sets: readonly SedSet[], a: BatchArrays, inWorker = false): number {
  const scratch = createFitScratch(bank);
  return takeItems(a.control, a.groupStart.length - 1, inWorker, (g) => {
    const g0 = a.groupStart[g] as number;
    const g1 = a.groupStart[g + 1] as number;
    const first = a.groupTasks[g0] as number;
    const set = sets[a.tasks[4 * first + 3] as number] as SedSet;
    let rings: Float64Array | null = null;
    for (let q = g0; q < g1; q++) {
      const i = a.groupTasks[q] as number;
      storeFit(a, i, () => {
        rings ??= positionRings(bank, set.combined, a.tasks[4 * i + 1] as number, a.tasks[4 * i + 2] as number, scratch, scratch.rings);
        scratch.rings = rings;
        return fitFromRings(bank, table, a.tasks[4 * i] as number, set.seds, rings, set.nodeTable, set.combined);
      });
    }
    return g1 - g0;
  });
}

/** Run one fit and store its result and status as task i of `a` (singular: FIT_SINGULAR; any other failure: FIT_FAILED). */
function storeFit(a: Pick<BatchArrays, "status" | "results" | "stride">, i: number, fit: () => ComponentFit): void {
  let status = FIT_OK;
  try {
    const f = fit();
    a.results.set(f.amplitudes, i * a.stride);
    a.results.set(f.covariance, i * a.stride + f.amplitudes.length);
  } catch (e) {
    status = e instanceof UmbraError && e.code === "BAD_DATA" ? FIT_SINGULAR : FIT_FAILED;
  }
  Atomics.store(a.status, i, status);
}

/** Read task i's fit from a batch's arrays (null when singular; INTERNAL when it failed). */
export function batchResult(a: Pick<BatchArrays, "status" | "results" | "stride">, i: number, nc: number): ComponentFit | null {
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

/** A fit position without a size: the SEDs (with their key) and the pixel position (0-based). */
export type PositionRequest = Omit<FitRequest, "thetaRad">;

/** The arrays a batch of ring computations shares between threads. */
export interface RingArrays {
  /** [next task to take, tasks finished, tasks finished by worker threads]. */
  readonly control: Int32Array;
  /** Per task: px, py, SED-set index. */
  readonly tasks: Float64Array;
  /** Per task, `stride` numbers: the position's rings (../mmf/fit.ts positionRings over the set's combined spectra). */
  readonly rings: Float64Array;
  readonly stride: number;
}

/** Allocate a ring batch for `positions` (stride: rings × spectra per position; SharedArrayBuffers when `shared`). */
export function ringArrays(positions: readonly PositionRequest[], setIndex: Int32Array, stride: number, shared: boolean): RingArrays {
  const n = positions.length;
  const buf = (bytes: number) => (shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes));
  const tasks = new Float64Array(buf(8 * 3 * n));
  positions.forEach((r, i) => tasks.set([r.px, r.py, setIndex[i] as number], 3 * i));
  return { control: new Int32Array(buf(12)), tasks, rings: new Float64Array(buf(8 * stride * n)), stride };
}

/** Take ring tasks until none is left and compute each position's rings into its slot; returns how many this thread did. */
export function runRingTasks(bank: FitBank, sets: readonly SedSet[], a: RingArrays, inWorker = false): number {
  const scratch = createFitScratch(bank);
  return takeItems(a.control, a.tasks.length / 3, inWorker, (i) => {
    const set = sets[a.tasks[3 * i + 2] as number] as SedSet;
    positionRings(bank, set.combined, a.tasks[3 * i] as number, a.tasks[3 * i + 1] as number, scratch, a.rings.subarray(i * a.stride, (i + 1) * a.stride));
    return 1;
  });
}

/** The arrays of a batch of fits from stored rings (a {@link RingArrays} batch's output), shared between threads. */
export interface RingFitArrays {
  /** [next task to take, tasks finished, tasks finished by worker threads]. */
  readonly control: Int32Array;
  /** The ring batch's per-position SED-set index and rings. */
  readonly positions: RingArrays;
  /** Per task: position index, θ (rad). */
  readonly tasks: Float64Array;
  /** Per task: status (see the FIT_* codes). */
  readonly status: Int32Array;
  /** Per task, `stride` numbers: nc amplitudes then nc × nc covariance. */
  readonly results: Float64Array;
  readonly stride: number;
}

/** Allocate a batch of fits (position index, θ) from the rings of `positions` (SharedArrayBuffers when `shared`). */
export function ringFitArrays(positions: RingArrays, list: readonly { index: number; thetaRad: number }[], ncMax: number, shared: boolean): RingFitArrays {
  const n = list.length;
  const stride = ncMax + ncMax * ncMax;
  const buf = (bytes: number) => (shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes));
  const tasks = new Float64Array(buf(8 * 2 * n));
  list.forEach((r, i) => tasks.set([r.index, r.thetaRad], 2 * i));
  return { control: new Int32Array(buf(12)), positions, tasks, status: new Int32Array(buf(4 * n)), results: new Float64Array(buf(8 * stride * n)), stride };
}

/** Take fits from stored rings until none is left (see {@link runBatchTasks}); returns how many this thread did. */
export function runRingFitTasks(bank: FitBank, table: ProfileTable, sets: readonly SedSet[], a: RingFitArrays, inWorker = false): number {
  const p = a.positions;
  return takeItems(a.control, a.status.length, inWorker, (i) => {
    const k = a.tasks[2 * i] as number;
    const set = sets[p.tasks[3 * k + 2] as number] as SedSet;
    storeFit(a, i, () => fitFromRings(bank, table, a.tasks[2 * i + 1] as number, set.seds, p.rings.subarray(k * p.stride, (k + 1) * p.stride), set.nodeTable, set.combined));
    return 1;
  });
}

/** The rings of several positions (one batch on a fit runner) and fits from them at any sizes. */
export interface RingSet {
  /** Number of positions. */
  readonly count: number;
  /** Fit position `index` at profile scale `thetaRad` in this thread (null where the Fisher matrix is singular). */
  fit(index: number, thetaRad: number): ComponentFit | null;
  /** Fit many (position, scale) pairs on the runner's threads, in list order; the same numbers as {@link RingSet.fit}. */
  fitMany(list: readonly { index: number; thetaRad: number }[]): (ComponentFit | null)[];
}
