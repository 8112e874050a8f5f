/**
 * `--shard i/N`: split independent work items over N processes (a batch scheduler's job array).
 * Shards are 1-based (i = 1 … N) and take contiguous blocks, so `umbra merge` can put the outputs
 * back in order and reproduce a single run exactly.
 */
import { UmbraError } from "@umbra/core";

/** One shard of N. */
export interface Shard {
  /** 1-based shard number. */
  index: number;
  count: number;
}

/** Parse `i/N` (1 ≤ i ≤ N); BAD_OPTION naming the text otherwise. */
export function parseShard(text: string): Shard {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  const index = m === null ? Number.NaN : Number(m[1]);
  const count = m === null ? Number.NaN : Number(m[2]);
  if (!(count >= 1) || !(index >= 1) || index > count) {
    throw new UmbraError("BAD_OPTION", `--shard ${text}: use i/N with 1 ≤ i ≤ N (e.g. 3/8)`, { field: "shard", value: text });
  }
  return { index, count };
}

/** The half-open range [start, end) of items 0 … n−1 that shard `s` owns (contiguous blocks, sizes differ by at most one). */
export function shardRange(n: number, s: Shard): { start: number; end: number } {
  return { start: Math.floor(((s.index - 1) * n) / s.count), end: Math.floor((s.index * n) / s.count) };
}
