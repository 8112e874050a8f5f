/**
 * Benchmark of umbra's FITS reader against astropy: uncompressed float32 images of 2048² and 4096²
 * pixels, written to a temporary folder with umbra's writer, read by `readFitsImage` as native
 * float32 (`dtype: "float32"`) and as float64 (the default), and by astropy through
 * `/usr/bin/python3 tests/bench/fits_read_astropy.py FILE` (`fits.open(..., memmap=False)` + `.data`,
 * and the same followed by `.astype(float64)`).
 *
 * Like for like, in two memory regimes (a read's cost depends as much on where its output lives as
 * on the reader; docs/fits-reader.md):
 * - **recycled memory**: astropy's array is dropped after each read, so CPython frees it at once and
 *   glibc hands the same, already-mapped pages to the next read; umbra reads into a reused array
 *   (`out`), which is what a JavaScript program does to get the same;
 * - **fresh memory**: every array is kept (a pipeline loading several band maps); each read's output
 *   is memory never touched before, on both sides.
 * A third umbra row, fresh arrays dropped after each read, shows what the same loop costs in Node,
 * where V8 frees the dropped arrays only at its next garbage collection (compared with astropy's
 * recycled row, as the literal "read the same file N times" loop).
 * umbra's float32 rows are compared with astropy's `.data` (raw float32; astropy leaves it
 * big-endian, umbra swaps to native order), umbra's float64 rows with `.astype(float64)`.
 *
 * Run: `npx tsx tests/bench/fits-read.ts [--quick] [--swap]` (prints JSON rows), or import
 * `benchFitsRead`; `--swap` prints only the byte-swap method comparison (`benchByteSwap`).
 * Timings are medians over several reads after one warm-up read, on a file already in the page cache,
 * each side's best of several rounds in fresh processes (see {@link benchFitsRead}).
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

/** Where the outputs of the timed reads live (see the module comment). */
export type MemoryRegime = "recycled" | "fresh, kept" | "fresh, dropped";

/** One benchmark result. */
export interface FitsReadBenchRow {
  name: string;
  regime: MemoryRegime;
  /** Median milliseconds per read by umbra. */
  umbraMs: number;
  /** What umbra is compared with. */
  reference: string;
  /** Median milliseconds per read by the reference, or null when astropy is not available. */
  referenceMs: number | null;
  /** umbraMs / referenceMs, or null. */
  ratio: number | null;
  /**
   * For float32 rows: astropy's `.data.astype(float32)` in native byte order in the same regime — the
   * very array umbra's float32 read returns — in ms; else null.
   */
  referenceNativeMs: number | null;
  /** True for the like-for-like rows that issue #2's floor (ratio ≤ 1) is about. */
  likeForLike: boolean;
  /** First read of this kind in the process (JIT and page faults included), umbra and the reference. */
  umbraFirstMs: number;
  referenceFirstMs: number | null;
  /** Reads per regime in each round. */
  runs: number;
  /** Rounds (fresh processes per side); each side's best round is reported. */
  rounds: number;
}

interface AstropyTime {
  first_ms: number;
  median_ms: number;
}

type AstropyTimes = Record<`${"data" | "native_float32" | "float64"}_${"recycled" | "kept"}`, AstropyTime>;

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

/** Untimed reads after the first one (JIT warm-up; astropy's script does the same). */
const WARM_UP = 2;

async function timeReads(runs: number, read: () => Promise<unknown>): Promise<{ first: number; median: number }> {
  const t0 = performance.now();
  await read();
  const first = performance.now() - t0;
  for (let w = 0; w < WARM_UP; w++) await read();
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

type Timing = { first: number; median: number };

/** umbra's reads of the file at `path` (an n×n float32 image) in each regime, float32 and float64 output. */
async function umbraTimes(path: string, n: number, runs: number): Promise<Record<string, Timing>> {
  const out: Record<string, Timing> = {};
  const o32 = new Float32Array(n * n);
  out["f32 recycled"] = await timeReads(runs, () => readFitsImage(path, { dtype: "float32", out: o32 }));
  const o64 = new Float64Array(n * n);
  out["f64 recycled"] = await timeReads(runs, () => readFitsImage(path, { out: o64 }));
  let kept: unknown[] = [];
  out["f32 fresh, kept"] = await timeReads(runs, async () => kept.push(await readFitsImage(path, { dtype: "float32" })));
  kept = [];
  out["f64 fresh, kept"] = await timeReads(runs, async () => kept.push(await readFitsImage(path)));
  kept = [];
  out["f32 fresh, dropped"] = await timeReads(runs, () => readFitsImage(path, { dtype: "float32" }));
  out["f64 fresh, dropped"] = await timeReads(runs, () => readFitsImage(path));
  return out;
}

const REGIMES: { regime: MemoryRegime; label: string; astropy: "recycled" | "kept"; likeForLike: boolean }[] = [
  { regime: "recycled", label: "reused array (`out`) vs astropy's recycled memory", astropy: "recycled", likeForLike: true },
  { regime: "fresh, kept", label: "fresh arrays, all kept, both sides", astropy: "kept", likeForLike: true },
  { regime: "fresh, dropped", label: "fresh arrays dropped (V8 frees at GC) vs astropy's recycled memory", astropy: "recycled", likeForLike: false },
];

/** umbra's timings in a child process of its own (a fresh heap and address layout each round). */
function umbraChildTimes(path: string, n: number, runs: number): Record<string, Timing> {
  const self = fileURLToPath(import.meta.url);
  const r = spawnSync(process.execPath, ["--import", "tsx", self, "--child", path, String(n), String(runs)], { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`umbra timing child failed: ${r.stderr}`);
  return JSON.parse(r.stdout.trim().split("\n").pop() ?? "") as Record<string, Timing>;
}

/** Per key, the round with the lowest median (ties: the first). */
function bestRound<T extends { median: number }>(rounds: readonly Record<string, T>[]): Record<string, T> {
  const best: Record<string, T> = {};
  for (const round of rounds) for (const [k, t] of Object.entries(round)) if (best[k] === undefined || t.median < (best[k] as T).median) best[k] = t;
  return best;
}

/**
 * Time the reads of 2048² and 4096² float32 images: `rounds` rounds (default 3; `quick`: 1 round of 3
 * reads), each running umbra and astropy in fresh processes one after the other (15 timed reads per regime
 * at 2048², 7 at 4096², after three untimed ones); each side keeps its best round per row, so a burst of load from other
 * processes, or an unlucky address layout (docs/fits-reader.md: 4K aliasing), in one round does not
 * decide the ratio.
 */
export async function benchFitsRead(options: { quick?: boolean; rounds?: number } = {}): Promise<FitsReadBenchRow[]> {
  const quick = options.quick ?? false;
  const rounds = quick ? 1 : (options.rounds ?? 3);
  const dir = mkdtempSync(join(tmpdir(), "umbra-bench-fits-"));
  const rows: FitsReadBenchRow[] = [];
  try {
    for (const n of [2048, 4096]) {
      const runs = quick ? 3 : n >= 4096 ? 7 : 15;
      const path = await writeImage(dir, n);
      const oursRounds: Record<string, Timing>[] = [];
      const refRounds: Record<string, { first_ms: number; median_ms: number; median: number }>[] = [];
      for (let r = 0; r < rounds; r++) {
        oursRounds.push(umbraChildTimes(path, n, runs));
        const ref = astropyTimes(path, runs);
        if (ref !== null) refRounds.push(Object.fromEntries(Object.entries(ref).filter(([, v]) => typeof v === "object").map(([k, v]) => [k, { ...v, median: v.median_ms }])));
      }
      const ours = bestRound(oursRounds);
      const ref = refRounds.length === 0 ? null : bestRound(refRounds);
      for (const dtype of ["f32", "f64"] as const) {
        for (const g of REGIMES) {
          const t = ours[`${dtype} ${g.regime}`] as Timing;
          const r = ref === null ? null : (ref[`${dtype === "f32" ? "data" : "float64"}_${g.astropy}`] ?? null);
          rows.push({
            name: `float32 ${n}² → ${dtype === "f32" ? "Float32Array" : "Float64Array"}, ${g.label}`,
            regime: g.regime,
            umbraMs: t.median,
            reference: `astropy \`.data${dtype === "f32" ? "" : ".astype(float64)"}\`, ${g.astropy}`,
            referenceMs: r?.median_ms ?? null,
            ratio: r === null ? null : t.median / r.median_ms,
            referenceNativeMs: dtype === "f32" ? (ref?.[`native_float32_${g.astropy}`]?.median_ms ?? null) : null,
            likeForLike: g.likeForLike,
            umbraFirstMs: t.first,
            referenceFirstMs: r?.first_ms ?? null,
            runs,
            rounds,
          });
        }
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
 * `DataView.getUint32` big-endian loop, and the WebAssembly SIMD swizzle through its scratch chunk
 * (copy in, swap, copy out), and on data already in the scratch (the reader's case: the file is read
 * straight into it).
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
          swapScratch(s, part.length, 4);
          part.set(s.subarray(0, part.length));
        }
      },
    ],
    [
      "WebAssembly SIMD swizzle in the scratch only (no copies)",
      () => {
        const s = scratchBytes();
        for (let o = 0; o < bytes; o += SWAP_CHUNK_BYTES) swapScratch(s, SWAP_CHUNK_BYTES, 4);
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
  const child = args.indexOf("--child");
  if (child >= 0) {
    const times = await umbraTimes(args[child + 1] ?? "", Number(args[child + 2]), Number(args[child + 3]));
    process.stdout.write(`${JSON.stringify(times)}\n`);
  } else if (args.includes("--swap")) {
    for (const r of benchByteSwap()) process.stdout.write(`${JSON.stringify(r)}\n`);
  } else {
    const rows = await benchFitsRead({ quick: args.includes("--quick") });
    for (const r of rows) process.stdout.write(`${JSON.stringify(r)}\n`);
  }
}
