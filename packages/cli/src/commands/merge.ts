/**
 * `umbra merge --out OUT DIR...`: join the outputs of sharded runs into exactly what one unsharded
 * run writes.
 * - `umbra regress --shard i/N` folders (each holds realisations/seed-<n>.json): OUT is a folder
 *   (summary.json, report/, realisations/); every shard must come from the same scenario (by SHA-256)
 *   and settings, and every seed is kept once.
 * - `umbra measure|search --tile DEG --shard i/N` tile folders (RESULTS.tiles/ with tile-NNNN.json):
 *   OUT is the results CSV (and its .json with `--json`); every tile must be there once, all from
 *   the same run key (inputs and settings).
 */
import type { Command } from "commander";
import { readdir } from "node:fs/promises";
import { join } from "node:path";
import { UmbraError } from "@umbra/core";
import { readRealisations, writeRealisation, writeRegressOutputs } from "../regress/outputs.js";
import { progress, writeFromTileDirs } from "./measure.js";

async function holdsTileFiles(dir: string): Promise<boolean> {
  try {
    return (await readdir(dir)).some((n) => /^tile-\d{4,}\.json$/.test(n));
  } catch {
    throw new UmbraError("NOT_FOUND", `${dir}: no such folder`, { file: dir });
  }
}

async function runMerge(dirs: readonly string[], o: { out: string; json?: boolean }): Promise<void> {
  if (dirs.length === 0) throw new UmbraError("BAD_OPTION", "umbra merge needs at least one shard folder", { field: "dirs" });
  const tiled = await Promise.all(dirs.map(holdsTileFiles));
  if (tiled.every((t) => t)) {
    await writeFromTileDirs(o.out, o.json === true, dirs);
    progress(`umbra merge: tiles from ${dirs.length} folder(s) → ${o.out}`);
    return;
  }
  if (tiled.some((t) => t)) throw new UmbraError("BAD_OPTION", "umbra merge: give either tile folders (measure/search) or regress folders, not both", { field: "dirs" });
  const found = await readRealisations(dirs);
  if (found.size === 0) throw new UmbraError("NOT_FOUND", `no realisations/seed-*.json or tile-NNNN.json in ${dirs.join(", ")}`, { field: "dirs" });
  const all = [...found.values()];
  const first = all[0]!;
  for (const r of all) {
    if (r.runKey !== first.runKey) {
      throw new UmbraError("BAD_DATA", `shards disagree: ${r.file} was made with another scenario or other settings than ${first.file}`, { file: r.file });
    }
  }
  for (const r of all) await writeRealisation(o.out, first.scenario, first.settings, r);
  await writeRegressOutputs(o.out, first.scenario, first.settings, all);
  progress(`umbra merge: ${all.length} realisations from ${dirs.length} folder(s) → ${join(o.out, "summary.json")}`);
}

/** Register `umbra merge`. */
export function register(program: Command): void {
  program
    .command("merge")
    .description("Join sharded outputs into what a single run writes: `umbra regress --shard` folders, or the tile folders of `umbra measure|search --tile --shard`.")
    .argument("<dirs...>", "shard output folders: regress folders (realisations/seed-<n>.json) or tile folders (tile-NNNN.json)")
    .requiredOption("--out <path>", "regress: output folder (summary.json, report/, realisations/); measure/search: the results CSV")
    .option("--json", "measure/search: also write the .json beside the CSV (diagnostics and provenance)")
    .action(async (dirs: string[], o: { out: string; json?: boolean }) => runMerge(dirs, o));
}
