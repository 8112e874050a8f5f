/**
 * Tile result files: one JSON file per sky tile, `tile-0003.json` in the run's tile folder
 * (`RESULTS.tiles/` beside `--out RESULTS.csv`), written atomically. Each file carries the run key
 * (SHA-256 of the command, settings, tiling and input hashes) and the run's metadata, so that
 * `--resume` can skip finished tiles and `umbra merge` can rebuild the single run's outputs from the
 * files of any set of shards. Non-finite numbers are kept exactly ({"$num": "NaN"}), which plain
 * JSON cannot do.
 */
import { mkdir, readdir, readFile } from "node:fs/promises";
import { join } from "node:path";
import { UmbraError } from "@umbra/core";
import { writeTextAtomic } from "@umbra/maps";
import type { TileOutput } from "./jobs.js";

/** Format tag of a tile file. */
export const TILE_FORMAT = "umbra-tile/1";

/** What every tile file of one run shares. */
export interface TileRun {
  readonly command: "measure" | "search";
  readonly runKey: string;
  readonly tileCount: number;
  /** Command-specific metadata needed to write the final outputs (provenance, settings, …). */
  readonly meta: Record<string, unknown>;
}

/** A tile file's content. */
export interface TileFile {
  readonly format: string;
  readonly run: TileRun;
  readonly tile: number;
  readonly result: TileOutput;
}

/** The tile folder beside an output file: RESULTS.csv → RESULTS.tiles. */
export function tileDirFor(out: string): string {
  return out.toLowerCase().endsWith(".csv") ? `${out.slice(0, -4)}.tiles` : `${out}.tiles`;
}

/** File name of tile `t`. */
export function tileFileName(t: number): string {
  return `tile-${String(t).padStart(4, "0")}.json`;
}

function encode(_key: string, v: unknown): unknown {
  return typeof v === "number" && !Number.isFinite(v) ? { $num: String(v) } : v;
}

function decode(_key: string, v: unknown): unknown {
  if (v !== null && typeof v === "object" && !Array.isArray(v)) {
    const o = v as Record<string, unknown>;
    const keys = Object.keys(o);
    if (keys.length === 1 && keys[0] === "$num" && typeof o["$num"] === "string") return Number(o["$num"]);
  }
  return v;
}

/** Write one tile's file atomically into `dir` (created if missing). */
export async function writeTileFile(dir: string, run: TileRun, tile: number, result: TileOutput): Promise<void> {
  await mkdir(dir, { recursive: true });
  const doc: TileFile = { format: TILE_FORMAT, run, tile, result };
  await writeTextAtomic(join(dir, tileFileName(tile)), `${JSON.stringify(doc, encode)}\n`);
}

/** Parse a tile file's text; BAD_DATA naming `file` when it is not one. */
export function parseTileFile(text: string, file: string): TileFile {
  let doc: unknown;
  try {
    doc = JSON.parse(text, decode);
  } catch (e) {
    throw new UmbraError("BAD_DATA", `${file}: not a tile file (${e instanceof Error ? e.message : String(e)})`, { file });
  }
  const d = doc as Partial<TileFile> | null;
  if (d === null || typeof d !== "object" || d.format !== TILE_FORMAT || typeof d.tile !== "number" || typeof d.run?.runKey !== "string" || d.result === undefined) {
    throw new UmbraError("BAD_DATA", `${file}: not a ${TILE_FORMAT} file`, { file });
  }
  return d as TileFile;
}

/** Read tile `t` of `dir` if it exists (null otherwise). */
export async function readTileFile(dir: string, t: number): Promise<TileFile | null> {
  const file = join(dir, tileFileName(t));
  let text: string;
  try {
    text = await readFile(file, "utf8");
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "ENOENT") return null;
    throw e;
  }
  return parseTileFile(text, file);
}

/** Every tile file in the folders `dirs` (files named tile-NNNN.json), in folder then name order. */
export async function readTileDirs(dirs: readonly string[]): Promise<{ file: string; doc: TileFile }[]> {
  const out: { file: string; doc: TileFile }[] = [];
  for (const dir of dirs) {
    let names: string[];
    try {
      names = await readdir(dir);
    } catch {
      throw new UmbraError("NOT_FOUND", `${dir}: no such folder`, { file: dir });
    }
    for (const n of names.filter((x) => /^tile-\d{4,}\.json$/.test(x)).sort()) {
      const file = join(dir, n);
      out.push({ file, doc: parseTileFile(await readFile(file, "utf8"), file) });
    }
  }
  return out;
}

/**
 * The tile results of one run from tile files: all from the same run (same key), each tile once
 * (a tile found twice must be identical), none missing (NOT_FOUND listing them).
 */
export function collectTiles(found: readonly { file: string; doc: TileFile }[]): { run: TileRun; results: TileOutput[] } {
  if (found.length === 0) throw new UmbraError("NOT_FOUND", "no tile-NNNN.json files found", { field: "dirs" });
  const first = found[0] as { file: string; doc: TileFile };
  const byTile = new Map<number, { file: string; doc: TileFile }>();
  for (const f of found) {
    if (f.doc.run.runKey !== first.doc.run.runKey) {
      throw new UmbraError("BAD_DATA", `shards disagree: ${f.file} comes from another run (other inputs or settings) than ${first.file}`, { file: f.file });
    }
    const seen = byTile.get(f.doc.tile);
    if (seen !== undefined && JSON.stringify(seen.doc.result, encode) !== JSON.stringify(f.doc.result, encode)) {
      throw new UmbraError("BAD_DATA", `tile ${f.doc.tile} differs between ${seen.file} and ${f.file}`, { file: f.file });
    }
    byTile.set(f.doc.tile, f);
  }
  const n = first.doc.run.tileCount;
  const missing = Array.from({ length: n }, (_, i) => i).filter((i) => !byTile.has(i));
  if (missing.length > 0) {
    throw new UmbraError("NOT_FOUND", `tiles ${missing.join(", ")} of ${n} are missing (run the shards that own them, or rerun with --resume)`, { field: "tile", value: missing[0] });
  }
  return { run: first.doc.run, results: Array.from({ length: n }, (_, i) => (byTile.get(i) as { doc: TileFile }).doc.result) };
}
