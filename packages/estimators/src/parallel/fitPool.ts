/**
 * Matched-filter fits over worker threads: a {@link FitRunner} runs a batch of fits (clusters,
 * sizes) on one bank, synchronously for the caller. With threads, the batch's inputs are posted to
 * every worker, and all threads — this one included — take tasks from a shared counter until none is
 * left (Atomics on SharedArrayBuffers), so the split balances itself; this thread then waits
 * (Atomics.wait) for the last task. Results are bit-identical whatever the number of threads.
 */
import type { Worker } from "node:worker_threads";
import { UmbraError, startWorker } from "@umbra/core";
import type { FilterBank } from "../mmf/bank.js";
import { ellRings, type ComponentFit, type FitBank } from "../mmf/fit.js";
import type { ProfileTable } from "../mmf/profile.js";
import {
  batchArrays,
  batchResult,
  ringArrays,
  ringFitArrays,
  runBatchTasks,
  runRingFitTasks,
  runRingTasks,
  sedSets,
  sedFilterOf,
  type FitRequest,
  type PositionRequest,
  type RingArrays,
  type RingFitArrays,
  type RingSet,
  type SedSet,
} from "./fitBatch.js";
import { mergeSizeSlots, runSizeTasks, sizeArrays } from "./sizeBatch.js";
import { runPaintTasks, type PaintArrays } from "./paintBatch.js";
import { paintClusters, type PaintedCluster } from "../photometry/model.js";
import type { Rfft2Plan } from "@umbra/maps";
import type { WhiteNoiseModel } from "../mmf/localNoise.js";
import type { WorkerMessage } from "./fitWorker.js";

/** Runs batches of fits; see module doc. */
export interface FitRunner {
  /** Threads that compute (this one included). */
  readonly threads: number;
  /** Fit every request on `bank` (null where the Fisher matrix is singular), in request order. */
  fitMany(bank: FilterBank, table: ProfileTable, requests: readonly FitRequest[]): (ComponentFit | null)[];
  /**
   * The rings of `positions` (one pass over the modes each, as one batch on the runner's threads),
   * from which each fit at any size costs one pass over the rings; fits equal
   * {@link FitRunner.fitMany}'s number for number. The set holds 8 bytes × rings × components per
   * position until it is dropped.
   */
  ringSet(bank: FilterBank, table: ProfileTable, positions: readonly PositionRequest[]): RingSet;
  /**
   * The S/N maps of a single-SED filter at every size (radians) on `bank`, folded into the best S/N
   * per pixel and the index of the size that gave it, plus each size's σ. `onMap` (given: this
   * thread runs every size, in order) sees each S/N map.
   */
  bestOverSizes(
    bank: FilterBank,
    plan: Rfft2Plan,
    table: ProfileTable,
    filter: { sed: Float64Array; sedKey: string },
    sizesRad: readonly number[],
    noise: WhiteNoiseModel | null,
    onMap?: (k: number, snr: Float64Array) => void,
  ): { best: Float64Array; arg: Uint8Array; sigmas: Float64Array };
  /** Copies of `spectra` with `sign` × every cluster's model added (see ../photometry/model.ts). */
  paint(bank: FilterBank, table: ProfileTable, spectra: readonly Float64Array[], clusters: readonly PaintedCluster[], sign: number): Float64Array[];
  /** Resolves when every worker thread has loaded (batches before that start with fewer threads). */
  whenReady(): Promise<void>;
  /** Fits and filter sizes computed so far by worker threads (not this one): a diagnostic. */
  readonly workerTasks: number;
  /** Stop the worker threads (the runner then computes in this thread only). */
  close(): Promise<void>;
}

/** Longest wait without a finished task before a batch is declared stuck (a worker died mid-task). */
const STALL_MS = 600_000;

/** A runner that fits in this thread only. */
export const serialFits: FitRunner = {
  threads: 1,
  fitMany(bank, table, requests) {
    const { sets, index } = cachedSedSets(bank, requests);
    const a = batchArrays(requests, index, false);
    runBatchTasks(bank, table, sets, a);
    return requests.map((r, i) => batchResult(a, i, r.seds.length));
  },
  ringSet(bank, table, positions) {
    const { sets, index } = cachedSedSets(bank, positions);
    const a = ringArrays(positions, index, ringStride(bank, positions), false);
    runRingTasks(bank, sets, a);
    return ringSetOf(bank, table, sets, a, positions, (f) => runRingFitTasks(bank, table, sets, f), false);
  },
  bestOverSizes(bank, plan, table, filter, sizesRad, noise, onMap) {
    const set = cachedSedSets(bank, [{ seds: [filter.sed], sedKey: filter.sedKey, px: 0, py: 0 }]).sets[0] as SedSet;
    const a = sizeArrays(sizesRad.length, plan.nx * plan.ny, 1, false);
    runSizeTasks(bank, plan, table, sedFilterOf(set), Float64Array.from(sizesRad), noise, a, 0, onMap);
    return { best: a.best[0] as Float64Array, arg: a.arg[0] as Uint8Array, sigmas: a.sigmas };
  },
  paint: (bank, table, spectra, clusters, sign) => paintClusters(bank, table, spectra, clusters, sign),
  whenReady: async () => undefined,
  workerTasks: 0,
  close: async () => undefined,
};

/** Numbers per position in a ring batch: rings × the widest SED set's components. */
function ringStride(bank: FilterBank, positions: readonly PositionRequest[]): number {
  return ellRings(bank).ell.length * Math.max(1, ...positions.map((p) => p.seds.length));
}

/**
 * The {@link RingSet} of a finished ring batch `a`. `onThreads` computes a batch of fits from its
 * rings on the runner's threads (arrays shared when `shared`) and returns when every fit is done;
 * single fits run here.
 */
function ringSetOf(bank: FilterBank, table: ProfileTable, sets: readonly SedSet[], a: RingArrays, positions: readonly PositionRequest[], onThreads: (f: RingFitArrays) => void, shared: boolean): RingSet {
  const ncMax = Math.max(1, ...positions.map((p) => p.seds.length));
  const batch = (list: readonly { index: number; thetaRad: number }[], threads: boolean): (ComponentFit | null)[] => {
    if (list.length === 0) return [];
    const f = ringFitArrays(a, list, ncMax, threads && shared);
    if (threads) onThreads(f);
    else runRingFitTasks(bank, table, sets, f);
    return list.map((r, i) => batchResult(f, i, (positions[r.index] as PositionRequest).seds.length));
  };
  return { count: positions.length, fit: (index, thetaRad) => batch([{ index, thetaRad }], false)[0] ?? null, fitMany: (list) => batch(list, true) };
}

/** Banks whose arrays the worker threads hold (oldest first dropped beyond this many). */
const KEPT_CONTEXTS = 3;

/** The arrays of `bank` that a fit thread reads, as plain data (the layout may be a class with getters). */
function portableBank(bank: FilterBank): FitBank {
  const l = bank.layout;
  return {
    nBands: bank.nBands,
    geometry: { ...bank.geometry },
    layout: { nx: l.nx, ny: l.ny, modeCount: l.modeCount, spectrumLength: l.spectrumLength, kxIndex: l.kxIndex, kyIndex: l.kyIndex, hermitianWeight: l.hermitianWeight },
    grid: { ...bank.grid },
    ells: bank.ells,
    nPix: bank.nPix,
    pixelSr: bank.pixelSr,
    qNodes: bank.qNodes,
    beamNodes: bank.beamNodes,
    whitened: [],
  };
}

/**
 * A runner on `threads` threads: this one plus threads − 1 worker threads (started now; each takes
 * a second or two to load, during which this thread works alone). `threads` ≤ 1 gives {@link serialFits}.
 * Each bank's arrays and SED combinations are posted to the workers once and kept for the next
 * batches on the same bank (the last few banks).
 */
export function createFitPool(threads: number, options: { callerTakesTasks?: boolean } = {}): FitRunner {
  // false: only the worker threads compute (tests use it to see them work); results are the same
  const callerTakes = options.callerTakesTasks ?? true;
  if (!Number.isInteger(threads) || threads < 1 || threads > 256) throw new UmbraError("BAD_OPTION", `fit threads ${threads}: use an integer from 1 to 256`, { field: "threads" });
  if (threads === 1) return serialFits;
  let workers: Worker[] = Array.from({ length: threads - 1 }, () => {
    const w = startWorker(new URL("./fitWorker.ts", import.meta.url));
    w.unref();
    return w;
  });
  const ready = Promise.all(workers.map((w) => new Promise<void>((resolve, reject) => {
    w.once("message", () => resolve());
    w.once("error", reject);
  }))).then(() => undefined);
  ready.catch(() => undefined);
  let workerTasks = 0;
  const ids = new WeakMap<FilterBank, number>();
  const live: { id: number; keys: Set<string> }[] = [];
  let nextId = 1;
  const post = (m: WorkerMessage): void => {
    for (const w of workers) w.postMessage(m);
  };
  /** Make sure the workers hold `bank` and the SED sets `keys`; returns the bank's id. */
  const share = (bank: FilterBank, keys: readonly string[], sets: readonly SedSet[]): number => {
    let id = ids.get(bank);
    let entry = id === undefined ? undefined : live.find((e) => e.id === id);
    if (id === undefined || entry === undefined) {
      id = nextId++;
      ids.set(bank, id);
      entry = { id, keys: new Set() };
      live.push(entry);
      post({ kind: "bank", id, bank: portableBank(bank), rings: ellRings(bank) });
      while (live.length > KEPT_CONTEXTS) post({ kind: "drop", id: (live.shift() as { id: number }).id });
    }
    const fresh = keys.flatMap((k, q) => (entry!.keys.has(k) ? [] : [{ key: k, set: sets[q] as SedSet }]));
    if (fresh.length > 0) {
      post({ kind: "sets", id, sets: fresh });
      for (const f of fresh) entry.keys.add(f.key);
    }
    return id;
  };
  const noiseIds = new WeakMap<WhiteNoiseModel, number>();
  /** Wait until `control[1]` reaches `n` (the batch's tasks are all finished). */
  const waitFor = (control: Int32Array, n: number, what: string): void => {
    let last = Atomics.load(control, 1);
    let since = Date.now();
    while (last < n) {
      Atomics.wait(control, 1, last, 1000);
      const now = Atomics.load(control, 1);
      if (now !== last) {
        last = now;
        since = Date.now();
      } else if (Date.now() - since > STALL_MS) {
        throw new UmbraError("INTERNAL", `a worker thread stopped in the middle of a batch (${n - last} of ${n} ${what} unfinished)`);
      }
    }
  };
  return {
    threads,
    fitMany(bank, table, requests) {
      if (requests.length === 0) return [];
      const { sets, index, keys } = cachedSedSets(bank, requests);
      const a = batchArrays(requests, index, true);
      // only batches of several fits are worth posting (the bank's arrays are copied once per bank)
      if (requests.length > 1 && workers.length > 0) {
        const id = share(bank, keys, sets);
        post({ kind: "batch", id, table: { ...table }, keys, arrays: a });
      }
      const posted = requests.length > 1 && workers.length > 0;
      if (callerTakes || !posted) runBatchTasks(bank, table, sets, a);
      waitFor(a.control, requests.length, "fits");
      workerTasks += Atomics.load(a.control, 2);
      return requests.map((r, i) => batchResult(a, i, r.seds.length));
    },
    ringSet(bank, table, positions) {
      if (positions.length < 2 || workers.length === 0) return serialFits.ringSet(bank, table, positions);
      const { sets, index, keys } = cachedSedSets(bank, positions);
      const a = ringArrays(positions, index, ringStride(bank, positions), true);
      const id = share(bank, keys, sets);
      post({ kind: "rings", id, keys, arrays: a });
      if (callerTakes) runRingTasks(bank, sets, a);
      waitFor(a.control, positions.length, "ring sums");
      workerTasks += Atomics.load(a.control, 2);
      return ringSetOf(bank, table, sets, a, positions, (f) => {
        const n = f.status.length;
        // a single fit from rings costs a pass over the rings only: not worth waking the workers
        const posted = n > 1 && workers.length > 0;
        if (posted) post({ kind: "ringFits", id: share(bank, keys, sets), table: { ...table }, keys, arrays: f });
        if (callerTakes || !posted) runRingFitTasks(bank, table, sets, f);
        waitFor(f.control, n, "fits from rings");
        workerTasks += Atomics.load(f.control, 2);
      }, true);
    },
    bestOverSizes(bank, plan, table, filter, sizesRad, noise, onMap) {
      if (onMap !== undefined || workers.length === 0 || sizesRad.length < 2) return serialFits.bestOverSizes(bank, plan, table, filter, sizesRad, noise, onMap);
      const { sets, keys } = cachedSedSets(bank, [{ seds: [filter.sed], sedKey: filter.sedKey, px: 0, py: 0 }]);
      const id = share(bank, keys, sets);
      let noiseId: number | null = null;
      if (noise !== null) {
        noiseId = noiseIds.get(noise) ?? null;
        if (noiseId === null) {
          noiseId = nextId++;
          noiseIds.set(noise, noiseId);
          post({ kind: "noise", id: noiseId, noise: { meanVariance: noise.meanVariance, varianceRatio: noise.varianceRatio } });
        }
      }
      const a = sizeArrays(sizesRad.length, plan.nx * plan.ny, workers.length + 1, true);
      const radians = Float64Array.from(sizesRad);
      workers.forEach((w, t) => w.postMessage({ kind: "sizes", id, key: filter.sedKey, table: { ...table }, sizesRad: radians, noiseId, arrays: a, slot: t + 1 } satisfies WorkerMessage));
      if (callerTakes) runSizeTasks(bank, plan, table, sedFilterOf(sets[0] as SedSet), radians, noise, a, 0);
      waitFor(a.control, sizesRad.length, "filter sizes");
      workerTasks += Atomics.load(a.control, 2);
      return { ...mergeSizeSlots(a), sigmas: Float64Array.from(a.sigmas) };
    },
    paint(bank, table, spectra, clusters, sign) {
      if (workers.length === 0 || clusters.length === 0) return serialFits.paint(bank, table, spectra, clusters, sign);
      const shared = (bytes: number) => new SharedArrayBuffer(bytes);
      const out = spectra.map((sp) => {
        const o = new Float64Array(shared(sp.byteLength));
        o.set(sp);
        return o;
      });
      const chunks = 4 * (workers.length + 1);
      const a: PaintArrays = { control: new Int32Array(shared(12)), out, chunk: Math.ceil(bank.layout.modeCount / chunks), chunks };
      const id = share(bank, [], []);
      post({ kind: "paint", id, table: { ...table }, clusters, sign, arrays: a });
      if (callerTakes) runPaintTasks(bank, table, clusters, sign, a);
      waitFor(a.control, chunks, "paint chunks");
      workerTasks += Atomics.load(a.control, 2);
      return out;
    },
    whenReady: () => ready,
    get workerTasks() {
      return workerTasks;
    },
    async close() {
      const ws = workers;
      workers = [];
      await Promise.all(ws.map((w) => w.terminate()));
    },
  };
}

const setCache = new WeakMap<FilterBank, Map<string, SedSet>>();

/** {@link sedSets} with each bank's SED combinations computed once (they cost a pass over every band's spectrum). */
function cachedSedSets(bank: FilterBank, requests: readonly PositionRequest[]): { sets: SedSet[]; index: Int32Array; keys: string[] } {
  let m = setCache.get(bank);
  if (m === undefined) {
    m = new Map();
    setCache.set(bank, m);
  }
  const byKey = new Map<string, number>();
  const sets: SedSet[] = [];
  const keys: string[] = [];
  const index = new Int32Array(requests.length);
  requests.forEach((r, i) => {
    let k = byKey.get(r.sedKey);
    if (k === undefined) {
      let set = m!.get(r.sedKey);
      if (set === undefined) {
        set = sedSets(bank, [r]).sets[0] as SedSet;
        m!.set(r.sedKey, set);
      }
      k = sets.length;
      byKey.set(r.sedKey, k);
      sets.push(set);
      keys.push(r.sedKey);
    }
    index[i] = k;
  });
  return { sets, index, keys };
}
