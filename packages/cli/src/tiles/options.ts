/**
 * The sky-tile and thread options that `umbra measure` and `umbra search` share: `--tile`,
 * `--tile-margin`, `--shard`, `--resume`, `--workers` — registered and parsed in one place.
 */
import type { Command } from "commander";
import { UmbraError } from "@umbra/core";
import type { TilingOptions } from "@umbra/estimators";
import { parseShard, type Shard } from "../shard.js";
import { numberOption } from "../commands/measure.js";

/** The options as commander hands them over. */
export interface TileCliOptions {
  tile?: string;
  tileMargin: string;
  shard?: string;
  resume?: boolean;
  workers: string;
  apodisation: string;
}

/** Add the tile and thread options to `cmd`: `verb` ("measure"/"search"), the output's name in help texts, and what threads share without tiles. */
export function addTileOptions(cmd: Command, verb: string, outName: string, threadWork: string): Command {
  return cmd
    .option("--tile <deg>", `${verb} the map in sky tiles of this core side in degrees, each with its own covariance (default: the whole map at once)`)
    .option("--tile-margin <arcmin>", "margin analysed around each tile's core, in arcmin (≥ --apodisation)", "30")
    .option("--shard <i/N>", `with --tile: compute only shard i of N (contiguous blocks of tiles) into ${outName}.tiles/; join with umbra merge`)
    .option("--resume", `with --tile: skip tiles whose file in ${outName}.tiles/ is already there from the same run`)
    .option("--workers <n>", `threads that compute: with --tile, tiles in parallel; otherwise ${threadWork} (0 or 1 = this thread only; results are the same)`, "0");
}

/** Parse the tile and thread options; BAD_OPTION for --shard/--resume without --tile or a margin narrower than the taper. */
export function parseTileOptions(o: TileCliOptions): { tiling: TilingOptions | null; shard: Shard | null; workers: number; resume: boolean } {
  const tiling = tilingOption(o);
  const shard = o.shard === undefined ? null : parseShard(o.shard);
  const workers = numberOption("workers", o.workers, (v) => Number.isInteger(v) && v >= 0 && v <= 256, "must be an integer from 0 (this thread) to 256");
  if (tiling === null && (shard !== null || o.resume === true)) {
    throw new UmbraError("BAD_OPTION", "--shard and --resume split a map into sky tiles: give --tile DEG too", { field: "tile" });
  }
  return { tiling, shard, workers, resume: o.resume === true };
}

/** `--tile DEG` and `--tile-margin ARCMIN` (null without --tile). */
function tilingOption(o: TileCliOptions): TilingOptions | null {
  if (o.tile === undefined) return null;
  const tileDeg = numberOption("tile", o.tile, (v) => v > 0, "must be a positive side in degrees");
  const marginArcmin = numberOption("tile-margin", o.tileMargin, (v) => v >= 0, "must be ≥ 0 arcmin");
  const apod = Number(o.apodisation);
  if (Number.isFinite(apod) && marginArcmin < apod) {
    throw new UmbraError("BAD_OPTION", `--tile-margin ${marginArcmin} arcmin is narrower than the ${apod}-arcmin edge taper: core clusters would sit in the taper`, { field: "tile-margin", value: o.tileMargin });
  }
  return { tileDeg, marginArcmin };
}
