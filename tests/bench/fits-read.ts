/**
 * Benchmark of umbra's FITS reader against astropy: uncompressed float32 images of 2048² and 4096²
 * pixels, written to a temporary folder with umbra's writer, read by `readFitsImage` (into a fresh
 * Float64Array, and into a reused one via `out`) and by astropy through
 * `/usr/bin/python3 tests/bench/fits_read_astropy.py FILE` (`fits.open(..., memmap=False)` + `.data`).
 *
 * Run: `npx tsx tests/bench/fits-read.ts [--quick]` (prints JSON rows), or import `benchFitsRead`.
 * Timings are medians over several reads after one warm-up read, on a file already in the page cache.
 * `ratio` = umbraMs / referenceMs (≤ 1 means umbra is no slower). `referenceFloat64Ms` is astropy's
 * read followed by `.astype(float64)`, the same output type as umbra's.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { readFitsImage, writeFits } from "../../packages/maps/src/fits/index.js";
import { median } from "./timing.js";

/** One benchmark result. */
export interface FitsReadBenchRow {
  name: string;
  /** Median milliseconds per read by umbra. */
  umbraMs: number;
  /** Median milliseconds per read by astropy (`.data`), or null when astropy is not available. */
  referenceMs: number | null;
  /** umbraMs / referenceMs, or null. */
  ratio: number | null;
  /** Median milliseconds of astropy's read + `.astype(float64)`, or null. */
  referenceFloat64Ms: number | null;
  /** First read in the process (JIT and page faults included), umbra and astropy. */
  umbraFirstMs: number;
  referenceFirstMs: number | null;
  runs: number;
}


interface AstropyTimes {
  data: { first_ms: number; median_ms: number };
  float64: { median_ms: number };
}

function astropyTimes(path: string, runs: number): AstropyTimes | null {
  const script = fileURLToPath(new URL("./fits_read_astropy.py", import.meta.url));
  const r = spawnSync("/usr/bin/python3", [script, path, String(runs)], { encoding: "utf8" });
  if (r.status !== 0) return null;
  try {
    return JSON.parse(r.stdout) as AstropyTimes;
  } catch {
    return null;
  }
}

/** Time the reads; `quick` reads 2048² only, with 3 runs. */
export async function benchFitsRead(options: { quick?: boolean } = {}): Promise<FitsReadBenchRow[]> {
  const quick = options.quick ?? false;
  const dir = mkdtempSync(join(tmpdir(), "umbra-bench-fits-"));
  const rows: FitsReadBenchRow[] = [];
  try {
    for (const n of quick ? [2048] : [2048, 4096]) {
      const runs = quick ? 3 : n >= 4096 ? 5 : 9;
      const data = new Float32Array(n * n);
      let s = 12345;
      for (let i = 0; i < data.length; i++) {
        s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
        data[i] = s / 4294967296 - 0.5;
      }
      const path = join(dir, `f32_${n}.fits`);
      await writeFits(path, [{ data, nx: n, ny: n }]);
      const t0 = performance.now();
      await readFitsImage(path);
      const firstMs = performance.now() - t0;
      const fresh: number[] = [];
      for (let r = 0; r < runs; r++) {
        const t = performance.now();
        await readFitsImage(path);
        fresh.push(performance.now() - t);
      }
      const out = new Float64Array(n * n);
      await readFitsImage(path, { out });
      const reused: number[] = [];
      for (let r = 0; r < runs; r++) {
        const t = performance.now();
        await readFitsImage(path, { out });
        reused.push(performance.now() - t);
      }
      const ref = astropyTimes(path, runs);
      const refMs = ref === null ? null : ref.data.median_ms;
      for (const [name, times] of [
        [`float32 ${n}x${n}`, fresh],
        [`float32 ${n}x${n} into a reused array`, reused],
      ] as const) {
        const umbraMs = median(times);
        rows.push({
          name,
          umbraMs,
          referenceMs: refMs,
          ratio: refMs === null ? null : umbraMs / refMs,
          referenceFloat64Ms: ref === null ? null : ref.float64.median_ms,
          umbraFirstMs: firstMs,
          referenceFirstMs: ref === null ? null : ref.data.first_ms,
          runs,
        });
      }
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return rows;
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const rows = await benchFitsRead({ quick: process.argv.includes("--quick") });
  for (const r of rows) process.stdout.write(`${JSON.stringify(r)}\n`);
}
