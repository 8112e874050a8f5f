/**
 * Running the tiles of a measure or search run: the tiles a shard owns (contiguous blocks, as
 * ../shard.ts deals them), skipping finished ones with `--resume`, in this thread or on a pool of
 * worker threads, each tile's file written atomically as soon as it is done; a progress bar on a
 * terminal.
 */
import { UmbraError } from "@umbra/core";
import type { BandStack } from "@umbra/estimators";
import { runPool } from "../pool.js";
import { progressBar } from "../progress.js";
import { shardRange, type Shard } from "../shard.js";
import { readTileFile, writeTileFile, type TileRun } from "./files.js";
import { runTileJob, type TileJob, type TileOutput } from "./jobs.js";

/** How to run a set of tiles. */
export interface TileRunOptions {
  /** Folder of the tile files. */
  readonly dir: string;
  readonly run: TileRun;
  /** This process's shard (null: every tile). */
  readonly shard: Shard | null;
  /** Skip tiles whose file exists with the same run key. */
  readonly resume: boolean;
  /** Threads that compute (0 or 1: this thread). */
  readonly workers: number;
  /** Progress-bar label. */
  readonly label: string;
}

/** The tile indices shard `s` owns out of `count` (all when `s` is null). */
export function shardTiles(count: number, s: Shard | null): number[] {
  const { start, end } = s === null ? { start: 0, end: count } : shardRange(count, s);
  return Array.from({ length: end - start }, (_, i) => start + i);
}

/** Run the tiles of `makeJob` this process owns; returns how many were computed and skipped. */
export async function runTiles(stack: BandStack, makeJob: (tile: number) => TileJob, o: TileRunOptions): Promise<{ computed: number; skipped: number; owned: number[] }> {
  const owned = shardTiles(o.run.tileCount, o.shard);
  const todo: TileJob[] = [];
  for (const t of owned) {
    if (o.resume) {
      const f = await readTileFile(o.dir, t);
      if (f !== null) {
        if (f.run.runKey !== o.run.runKey) {
          throw new UmbraError("BAD_OPTION", `--resume: ${o.dir} holds tile ${t} of another run (other inputs or settings): use another --out or remove that folder`, { file: o.dir });
        }
        continue;
      }
    }
    todo.push(makeJob(t));
  }
  const bar = progressBar(o.label, owned.length, owned.length - todo.length);
  let done = owned.length - todo.length;
  const keep = async (result: TileOutput, job: TileJob): Promise<void> => {
    await writeTileFile(o.dir, o.run, job.tile, result);
    bar.update(++done);
  };
  try {
    if (o.workers > 1) await runPool<TileJob, TileOutput>(new URL("./worker.ts", import.meta.url), todo, o.workers, (j) => `tile ${j.tile}`, keep);
    else for (const job of todo) await keep(runTileJob(stack, job), job);
  } finally {
    bar.stop();
  }
  return { computed: todo.length, skipped: owned.length - todo.length, owned };
}
