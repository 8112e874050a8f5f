/**
 * Benchmark of umbra's FITS reader against astropy: uncompressed float32 images of 2048² and 4096²
 * pixels, written to a temporary folder with umbra's writer, read by `readFitsImage` four ways —
 * native float32 (`dtype: "float32"`) and float64 (the default), each into a fresh array and into a
 * reused one (`out`) — and by astropy through
 * `/usr/bin/python3 tests/bench/fits_read_astropy.py FILE` (`fits.open(..., memmap=False)` + `.data`,
 * and the same followed by `.astype(float64)`).
 *
 * Like for like: umbra's float32 rows are compared with astropy's `.data` (raw float32; astropy leaves
 * it big-endian, umbra swaps to native order), umbra's float64 rows with `.astype(float64)`.
 *
 * Run: `npx tsx tests/bench/fits-read.ts [--quick] [--hugetlb] [--swap]` (prints JSON rows), or import
 * `benchFitsRead`. `--hugetlb` adds the fresh-array rows of a child process started with
 * `GLIBC_TUNABLES=glibc.malloc.hugetlb=1` (glibc then asks for transparent huge pages, as numpy does
 * for its large arrays); `--swap` prints only the byte-swap method comparison (`benchByteSwap`).
 * Timings are medians over several reads after one warm-up read, on a file already in the page cache.
 * `ratio` = umbraMs / referenceMs (≤ 1 means umbra is no slower).
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { readFitsImage, writeFits } from "../../packages/maps/src/fits/index.js";
import { scratchBytes, simdSwapAvailable, swapScratch, SWAP_CHUNK_BYTES } from "../../packages/maps/src/fits/byteswap.js";
import { median } from "./timing.js";

/** One benchmark result. */
export interface FitsReadBenchRow {
  name: string;
  /** Median milliseconds per read by umbra. */
  umbraMs: number;
  /** What umbra is compared with. */
  reference: string;
  /** Median milliseconds per read by the reference, or null when astropy is not available. */
  referenceMs: number | null;
  /** umbraMs / referenceMs, or null. */
  ratio: number | null;
  /** For float32 rows: astropy's `.data.astype(float32)` in native byte order (umbra's output exactly), ms; else null. */
  referenceNativeMs: number | null;
  /** First read of this kind in the process (JIT and page faults included), umbra and the reference. */
  umbraFirstMs: number;
  referenceFirstMs: number | null;
  runs: number;
}

interface AstropyTimes {
  data: { first_ms: number; median_ms: number };
  native_float32: { first_ms: number; median_ms: number };
  float64: { first_ms: number; median_ms: number };
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

async function timeReads(runs: number, read: () => Promise<unknown>): Promise<{ first: number; median: number }> {
  const t0 = performance.now();
  await read();
  const first = performance.now() - t0;
  const t: number[] = [];
  for (let r = 0; r < runs; r++) {
    const s = performance.now();
    await read();
    t.push(performance.now() - s);
  }
  return { first, median: median(t) };
}

async function writeImage(dir: string, n: number): Promise<string> {
  const data = new Float32Array(n * n);
  let s = 12345;
  for (let i = 0; i < data.length; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    data[i] = s / 4294967296 - 0.5;
  }
  const path = join(dir, `f32_${n}.fits`);
  await writeFits(path, [{ data, nx: n, ny: n }]);
  return path;
}

/** umbra's four reads of the file at `path` (an n×n float32 image), fresh ones only when `freshOnly`. */
async function umbraTimes(path: string, n: number, runs: number, freshOnly: boolean): Promise<Record<string, { first: number; median: number }>> {
  const out: Record<string, { first: number; median: number }> = {};
  out["f32 fresh"] = await timeReads(runs, () => readFitsImage(path, { dtype: "float32" }));
  out["f64 fresh"] = await timeReads(runs, () => readFitsImage(path));
  if (!freshOnly) {
    const o32 = new Float32Array(n * n);
    out["f32 reused"] = await timeReads(runs, () => readFitsImage(path, { dtype: "float32", out: o32 }));
    const o64 = new Float64Array(n * n);
    out["f64 reused"] = await timeReads(runs, () => readFitsImage(path, { out: o64 }));
  }
  return out;
}

const LABELS: Record<string, string> = {
  "f32 fresh": "→ Float32Array, fresh",
  "f32 reused": "→ Float32Array, reused (`out`)",
  "f64 fresh": "→ Float64Array, fresh",
  "f64 reused": "→ Float64Array, reused (`out`)",
};

/** The hugetlb child: umbra's fresh-array timings as one JSON line. */
async function hugetlbChild(path: string, n: number, runs: number): Promise<void> {
  process.stdout.write(`${JSON.stringify(await umbraTimes(path, n, runs, true))}\n`);
}

function hugetlbTimes(path: string, n: number, runs: number): Record<string, { first: number; median: number }> | null {
  const self = fileURLToPath(import.meta.url);
  const r = spawnSync(process.execPath, ["--import", "tsx", self, "--hugetlb-child", path, String(n), String(runs)], {
    encoding: "utf8",
    env: { ...process.env, GLIBC_TUNABLES: "glibc.malloc.hugetlb=1" },
  });
  if (r.status !== 0) return null;
  try {
    return JSON.parse(r.stdout.trim().split("\n").pop() ?? "") as Record<string, { first: number; median: number }>;
  } catch {
    return null;
  }
}

/**
 * Time the reads of 2048² and 4096² float32 images (`quick`: 3 reads each, else 9 and 5); with
 * `hugetlb`, also the fresh-array reads in a child process with `GLIBC_TUNABLES=glibc.malloc.hugetlb=1`.
 */
export async function benchFitsRead(options: { quick?: boolean; hugetlb?: boolean } = {}): Promise<FitsReadBenchRow[]> {
  const quick = options.quick ?? false;
  const dir = mkdtempSync(join(tmpdir(), "umbra-bench-fits-"));
  const rows: FitsReadBenchRow[] = [];
  try {
    for (const n of [2048, 4096]) {
      const runs = quick ? 3 : n >= 4096 ? 5 : 9;
      const path = await writeImage(dir, n);
      const ours = await umbraTimes(path, n, runs, false);
      const ref = astropyTimes(path, runs);
      const huge = options.hugetlb === true ? hugetlbTimes(path, n, runs) : null;
      for (const key of ["f32 fresh", "f32 reused", "f64 fresh", "f64 reused"]) {
        const f32 = key.startsWith("f32");
        const r = ref === null ? null : f32 ? ref.data : ref.float64;
        const push = (label: string, t: { first: number; median: number }): void => {
          rows.push({
            name: `float32 ${n}² ${label}`,
            umbraMs: t.median,
            reference: f32 ? "astropy `.data`" : "astropy `.data.astype(float64)`",
            referenceMs: r?.median_ms ?? null,
            ratio: r === null ? null : t.median / r.median_ms,
            referenceNativeMs: f32 && ref !== null ? ref.native_float32.median_ms : null,
            umbraFirstMs: t.first,
            referenceFirstMs: r?.first_ms ?? null,
            runs,
          });
        };
        push(LABELS[key] as string, ours[key] as { first: number; median: number });
        const h = huge?.[key];
        if (h !== undefined) push(`${LABELS[key] as string}, glibc hugetlb=1`, h);
      }
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return rows;
}

/** One byte-swap timing: milliseconds to swap 16 MiB of 32-bit values in memory. */
export interface ByteSwapBenchRow {
  method: string;
  msPer16MiB: number;
  runs: number;
}

/**
 * The byte-swap methods considered for the reader, on a 16 MiB buffer (4 Mi float32 values, one
 * 2048² image) already in memory: Node's `Buffer.swap32`, a `Uint32Array` shift-and-mask loop, a
 * `DataView.getUint32` big-endian loop, and the WebAssembly SIMD swizzle through its 256 KiB scratch
 * (copy in, swap, copy out), as the reader uses it.
 */
export function benchByteSwap(runs = 15): ByteSwapBenchRow[] {
  const bytes = 16 * 2 ** 20;
  const u8 = new Uint8Array(bytes);
  for (let i = 0; i < bytes; i++) u8[i] = (i * 2654435761) >>> 24;
  const u32 = new Uint32Array(u8.buffer);
  const dv = new DataView(u8.buffer);
  const methods: [string, () => void][] = [
    ["Node Buffer.swap32", () => void Buffer.from(u8.buffer).swap32()],
    [
      "Uint32Array loop (shifts and masks)",
      () => {
        for (let i = 0; i < u32.length; i++) {
          const x = u32[i] as number;
          u32[i] = ((x & 0xff) << 24) | ((x & 0xff00) << 8) | ((x >>> 8) & 0xff00) | (x >>> 24);
        }
      },
    ],
    [
      "DataView getUint32 big-endian loop",
      () => {
        for (let i = 0; i < u32.length; i++) u32[i] = dv.getUint32(4 * i, false);
      },
    ],
    [
      `WebAssembly SIMD swizzle via ${SWAP_CHUNK_BYTES / 1024} KiB scratch${simdSwapAvailable() ? "" : " (unavailable: Buffer fallback)"}`,
      () => {
        const s = scratchBytes();
        for (let o = 0; o < bytes; o += SWAP_CHUNK_BYTES) {
          const part = u8.subarray(o, o + SWAP_CHUNK_BYTES);
          s.set(part);
          swapScratch(part.length, 4);
          part.set(s.subarray(0, part.length));
        }
      },
    ],
    [
      "WebAssembly SIMD swizzle in the scratch only (no copies)",
      () => {
        for (let o = 0; o < bytes; o += SWAP_CHUNK_BYTES) swapScratch(SWAP_CHUNK_BYTES, 4);
      },
    ],
  ];
  return methods.map(([method, f]) => {
    f();
    const t: number[] = [];
    for (let r = 0; r < runs; r++) {
      const t0 = performance.now();
      f();
      t.push(performance.now() - t0);
    }
    return { method, msPer16MiB: median(t), runs };
  });
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const args = process.argv.slice(2);
  const child = args.indexOf("--hugetlb-child");
  if (child >= 0) {
    await hugetlbChild(args[child + 1] ?? "", Number(args[child + 2]), Number(args[child + 3]));
  } else if (args.includes("--swap")) {
    for (const r of benchByteSwap()) process.stdout.write(`${JSON.stringify(r)}\n`);
  } else {
    const rows = await benchFitsRead({ quick: args.includes("--quick"), hugetlb: args.includes("--hugetlb") });
    for (const r of rows) process.stdout.write(`${JSON.stringify(r)}\n`);
  }
}
