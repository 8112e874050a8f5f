/**
 * Painting cluster models into band spectra as a batch: the modes are cut into chunks that threads
 * take from a shared counter; each chunk gets every cluster in list order (../photometry/model.ts
 * paintModeRange), so the result equals one thread painting all modes.
 */
import { takeItems } from "./counter.js";
import type { FitBank } from "../mmf/fit.js";
import type { ProfileTable } from "../mmf/profile.js";
import { paintModeRange, type PaintedCluster } from "../photometry/model.js";

/** The arrays a paint batch shares between threads. */
export interface PaintArrays {
  /** [next chunk to take, chunks finished, chunks finished by worker threads]. */
  readonly control: Int32Array;
  /** The band spectra painted into (a copy of the input, on SharedArrayBuffers). */
  readonly out: readonly Float64Array[];
  /** Modes per chunk and number of chunks. */
  readonly chunk: number;
  readonly chunks: number;
}

/** Take chunks until none is left and paint `clusters` × `sign` into them; returns how many this thread did. */
export function runPaintTasks(bank: FitBank, table: ProfileTable, clusters: readonly PaintedCluster[], sign: number, a: PaintArrays, inWorker = false): number {
  const n = bank.layout.modeCount;
  return takeItems(a.control, a.chunks, inWorker, (k) => {
    paintModeRange(bank, table, a.out, clusters, sign, k * a.chunk, Math.min(n, (k + 1) * a.chunk));
    return 1;
  });
}
