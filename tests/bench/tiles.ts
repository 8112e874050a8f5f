/**
 * Benchmark of tiled forced photometry and blind search (`umbra measure|search --tile`): the
 * invented 1024² three-band deep field of fixtures/scenarios/deep-1024-timing.json (about 110
 * clusters; quick: the 256² deep-small-field), measured with its truth catalogue and searched at
 * 15 sizes — untiled, tiled in this thread, and tiled on 2 worker threads (the two tiled runs write
 * identical files; worker start-up, about 2 s per thread, is included). Wall-clock seconds of one
 * run each through the CLI.
 *
 * Run: `npx tsx tests/bench/tiles.ts [--quick]` (prints JSON rows), or `npm run bench -- tiles`.
 */
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

/** One timed run. */
export interface TileBenchRow {
  command: "measure" | "search";
  run: string;
  tiles: number;
  seconds: number;
  /** Tiled one-thread seconds ÷ this run's seconds. */
  speedUpVsTiledOneThread: number | null;
}

/** Time untiled, tiled and tiled-on-2-workers runs of measure and search on a simulated field. */
export async function benchTiles(opts: { quick: boolean }): Promise<TileBenchRow[]> {
  const { run } = await import("../../packages/cli/src/main.js");
  const scenario = fileURLToPath(new URL(`../../fixtures/scenarios/${opts.quick ? "deep-small-field" : "deep-1024-timing"}.json`, import.meta.url));
  const tileDeg = opts.quick ? "1.1" : "4.3";
  const dir = mkdtempSync(join(tmpdir(), "umbra-bench-tiles-"));
  const rows: TileBenchRow[] = [];
  const quietly = async (argv: string[]): Promise<number> => {
    const write = process.stderr.write.bind(process.stderr);
    const writeOut = process.stdout.write.bind(process.stdout);
    process.stderr.write = () => true;
    process.stdout.write = () => true;
    try {
      const t0 = performance.now();
      const code = await run(argv);
      if (code !== 0) throw new Error(`umbra ${argv.join(" ")} exited ${code}`);
      return (performance.now() - t0) / 1000;
    } finally {
      process.stderr.write = write;
      process.stdout.write = writeOut;
    }
  };
  try {
    await quietly(["simulate", "--scenario", scenario, "--seed", "11", "--out", join(dir, "field")]);
    const manifest = join(dir, "field", "bands.json");
    const catalog = join(dir, "field", "truth_clusters.csv");
    for (const command of ["measure", "search"] as const) {
      const base = command === "measure" ? ["measure", "--bands", manifest, "--catalog", catalog, "--no-relativistic"] : ["search", "--bands", manifest];
      let oneThread = NaN;
      const configs: [string, string[]][] = [
        ["whole map", []],
        ["tiled, 1 thread", ["--tile", tileDeg]],
        ["tiled, 2 worker threads", ["--tile", tileDeg, "--workers", "2"]],
      ];
      for (const [label, extra] of configs) {
        const out = join(dir, `${command}-${rows.length}.csv`);
        const seconds = await quietly([...base, ...extra, "--out", out, "--json"]);
        const doc = JSON.parse(readFileSync(out.replace(/\.csv$/, ".json"), "utf8")) as { diagnostics: { tiles?: unknown[] } };
        if (label === "tiled, 1 thread") oneThread = seconds;
        rows.push({ command, run: label, tiles: doc.diagnostics.tiles?.length ?? 1, seconds, speedUpVsTiledOneThread: extra.length === 0 ? null : oneThread / seconds });
      }
      const [a, b] = [rows.length - 2, rows.length - 1].map((k) => readFileSync(join(dir, `${command}-${k}.csv`), "utf8"));
      if (a !== b) throw new Error(`${command}: the worker-pool run wrote other bytes than the one-thread tiled run`);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return rows;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  benchTiles({ quick: process.argv.includes("--quick") }).then((r) => console.log(JSON.stringify(r, null, 2)));
}
