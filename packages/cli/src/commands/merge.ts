/**
 * `umbra merge --out DIR SHARD_DIR...`: join the folders written by `umbra regress --shard i/N`
 * into exactly what one unsharded run writes (summary.json, report/, realisations/). It checks that
 * every shard used the same scenario (by SHA-256) and settings and that every seed is there once.
 */
import type { Command } from "commander";
import { join } from "node:path";
import { UmbraError } from "@umbra/core";
import { readRealisations, writeRealisation, writeRegressOutputs } from "../regress/outputs.js";
import { progress } from "./measure.js";

async function runMerge(dirs: readonly string[], o: { out: string }): Promise<void> {
  if (dirs.length === 0) throw new UmbraError("BAD_OPTION", "umbra merge needs at least one shard folder", { field: "dirs" });
  const found = await readRealisations(dirs);
  if (found.size === 0) throw new UmbraError("NOT_FOUND", `no realisations/seed-*.json in ${dirs.join(", ")}`, { field: "dirs" });
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
    .description("Join the output folders of `umbra regress --shard i/N` runs into what a single run writes.")
    .argument("<dirs...>", "shard output folders (each holds realisations/seed-<n>.json)")
    .requiredOption("--out <dir>", "output folder: summary.json, report/, realisations/")
    .action(async (dirs: string[], o: { out: string }) => runMerge(dirs, o));
}
