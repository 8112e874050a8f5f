/**
 * Benchmark of `--workers` in forced photometry and blind search: the invented 1024² three-band
 * deep field of fixtures/scenarios/deep-1024-timing.json (about 110 clusters; quick: the 256²
 * deep-small-field), measured with its truth catalogue (masses included) and searched at 15 sizes —
 * on the whole map with 1 and 2 threads (fits and filter sizes shared), and in sky tiles with 1 and
 * 2 threads. Each pair writes identical files (checked here); thread start-up (about 1–2 s) is
 * included. Wall-clock seconds of one run each through the CLI.
 *
 * Run: `npx tsx tests/bench/threads.ts [--quick]` (prints JSON rows), or `npm run bench -- threads`.
 */
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

/** One timed run. */
export interface ThreadBenchRow {
  command: "measure" | "search";
  run: string;
  threads: number;
  tiles: number;
  seconds: number;
  /** The same layout's one-thread seconds ÷ this run's seconds. */
  speedUp: number;
}

/** Time measure and search on a simulated field: whole map and tiled, each on 1 and 2 threads. */
export async function benchThreads(opts: { quick: boolean }): Promise<ThreadBenchRow[]> {
  const { run } = await import("../../packages/cli/src/main.js");
  const scenario = fileURLToPath(new URL(`../../fixtures/scenarios/${opts.quick ? "deep-small-field" : "deep-1024-timing"}.json`, import.meta.url));
  const tileDeg = opts.quick ? "1.1" : "4.3";
  const dir = mkdtempSync(join(tmpdir(), "umbra-bench-tiles-"));
  const rows: ThreadBenchRow[] = [];
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
      for (const [layout, extra] of [["whole map", []], [`tiles of ${tileDeg}°`, ["--tile", tileDeg]]] as const) {
        let oneThread = NaN;
        const outs: string[] = [];
        for (const threads of [1, 2]) {
          const out = join(dir, `${command}-${rows.length}.csv`);
          const seconds = await quietly([...base, ...extra, "--workers", String(threads), "--out", out, "--json"]);
          const doc = JSON.parse(readFileSync(out.replace(/\.csv$/, ".json"), "utf8")) as { diagnostics: { tiles?: unknown[] } };
          if (threads === 1) oneThread = seconds;
          outs.push(readFileSync(out, "utf8"));
          rows.push({ command, run: layout, threads, tiles: doc.diagnostics.tiles?.length ?? 1, seconds, speedUp: oneThread / seconds });
        }
        if (outs[0] !== outs[1]) throw new Error(`${command} (${layout}): 2 threads wrote other bytes than 1 thread`);
      }
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return rows;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  benchThreads({ quick: process.argv.includes("--quick") }).then((r) => console.log(JSON.stringify(r, null, 2)));
}
