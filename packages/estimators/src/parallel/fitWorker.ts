/** Worker thread of a fit pool (./fitPool.ts): keeps the banks it is sent and runs the tasks of every batch. */
import { parentPort } from "node:worker_threads";
import { isUmbraWorker } from "@umbra/core";
import { seedEllRings, type EllRings, type FitBank } from "../mmf/fit.js";
import type { ProfileTable } from "../mmf/profile.js";
import { getRfft2Plan } from "@umbra/maps";
import type { WhiteNoiseModel } from "../mmf/localNoise.js";
import { runBatchTasks, runRingFitTasks, runRingTasks, sedFilterOf, type BatchArrays, type RingArrays, type RingFitArrays, type SedSet } from "./fitBatch.js";
import { runSizeTasks, type SizeArrays } from "./sizeBatch.js";
import { runPaintTasks, type PaintArrays } from "./paintBatch.js";
import type { PaintedCluster } from "../photometry/model.js";

/** What the pool posts: a bank's arrays (copied once), SED sets for it, batches (shared arrays), and drops. */
export type WorkerMessage =
  | { readonly kind: "bank"; readonly id: number; readonly bank: FitBank; readonly rings: EllRings }
  | { readonly kind: "sets"; readonly id: number; readonly sets: readonly { key: string; set: SedSet }[] }
  | { readonly kind: "batch"; readonly id: number; readonly table: ProfileTable; readonly keys: readonly string[]; readonly arrays: BatchArrays }
  | { readonly kind: "rings"; readonly id: number; readonly keys: readonly string[]; readonly arrays: RingArrays }
  | { readonly kind: "ringFits"; readonly id: number; readonly table: ProfileTable; readonly keys: readonly string[]; readonly arrays: RingFitArrays }
  | { readonly kind: "drop"; readonly id: number }
  | { readonly kind: "noise"; readonly id: number; readonly noise: WhiteNoiseModel }
  | { readonly kind: "paint"; readonly id: number; readonly table: ProfileTable; readonly clusters: readonly PaintedCluster[]; readonly sign: number; readonly arrays: PaintArrays }
  | {
      readonly kind: "sizes";
      readonly id: number;
      readonly key: string;
      readonly table: ProfileTable;
      readonly sizesRad: Float64Array;
      readonly noiseId: number | null;
      readonly arrays: SizeArrays;
      readonly slot: number;
    };

if (parentPort !== null && isUmbraWorker()) {
  parentPort.postMessage("ready");
  const banks = new Map<number, { bank: FitBank; sets: Map<string, SedSet> }>();
  // the latest noise model only (one search at a time)
  let noise: { id: number; model: WhiteNoiseModel } | null = null;
  parentPort.on("message", (m: WorkerMessage) => {
    if (m.kind === "bank") {
      seedEllRings(m.bank.ells, m.rings);
      banks.set(m.id, { bank: m.bank, sets: new Map() });
    }
    else if (m.kind === "drop") banks.delete(m.id);
    else if (m.kind === "noise") noise = { id: m.id, model: m.noise };
    else if (m.kind === "paint") {
      const b = banks.get(m.id);
      if (b !== undefined) runPaintTasks(b.bank, m.table, m.clusters, m.sign, m.arrays, true);
    }
    else if (m.kind === "sizes") {
      const b = banks.get(m.id);
      const set = b?.sets.get(m.key);
      if (b === undefined || set === undefined) return; // cannot happen; this thread sits the batch out
      if (m.noiseId !== null && noise?.id !== m.noiseId) return;
      const plan = getRfft2Plan(b.bank.geometry.nx, b.bank.geometry.ny);
      runSizeTasks(b.bank, plan, m.table, sedFilterOf(set), m.sizesRad, m.noiseId === null ? null : (noise as { model: WhiteNoiseModel }).model, m.arrays, m.slot);
    }
    else if (m.kind === "sets") {
      const b = banks.get(m.id);
      if (b !== undefined) for (const s of m.sets) b.sets.set(s.key, s.set);
    } else if (m.kind === "batch") {
      const b = banks.get(m.id);
      if (b === undefined) return; // cannot happen (banks are dropped only after newer ones); this thread sits the batch out
      const sets = m.keys.map((k) => b.sets.get(k));
      if (sets.some((s) => s === undefined)) return;
      runBatchTasks(b.bank, m.table, sets as SedSet[], m.arrays, true);
    } else if (m.kind === "rings") {
      const b = banks.get(m.id);
      const sets = m.keys.map((k) => b?.sets.get(k));
      if (b === undefined || sets.some((s) => s === undefined)) return; // cannot happen; this thread sits the batch out
      runRingTasks(b.bank, sets as SedSet[], m.arrays, true);
    } else if (m.kind === "ringFits") {
      const b = banks.get(m.id);
      const sets = m.keys.map((k) => b?.sets.get(k));
      if (b === undefined || sets.some((s) => s === undefined)) return; // cannot happen; this thread sits the batch out
      runRingFitTasks(b.bank, m.table, sets as SedSet[], m.arrays, true);
    }
  });
}
