/**
 * Benchmark of umbra's real 2-D FFT round trip (forward + inverse), float64 and float32, at the
 * shapes of tests/bench/fft_numpy.py, plus the peak memory of six 4096² bands transformed in turn.
 *
 * Run: `npx tsx tests/bench/fft.ts [--quick]` (timings) or `npx tsx tests/bench/fft.ts --memory` (memory
 * only, in its own process), both print JSON; or import
 * `benchFft` from another script. Compare with `python3 tests/bench/fft_numpy.py` run on the same
 * quiet machine. Timings are medians over several runs after three warm-up calls (numpy's too).
 */
import { pathToFileURL } from "node:url";
import { createRfft2PlanFloat32, getRfft2Plan } from "../../packages/maps/src/fourier/index.js";
import { median } from "./timing.js";

/** One benchmark result. */
export interface FftBenchRow {
  backend: "f64" | "f32";
  nx: number;
  ny: number;
  /** Median wall-clock seconds per round trip. */
  roundTripSeconds: number;
  /** Median process CPU seconds per round trip (robust on a busy machine). */
  roundTripCpuSeconds: number;
  runs: number;
}

const SHAPES: [number, number][] = [
  [1024, 1024],
  [2048, 2048],
  [4096, 4096],
  [900, 600], // nx, ny
];


function fillRandom(a: Float64Array | Float32Array, seed: number): void {
  let s = seed >>> 0;
  for (let i = 0; i < a.length; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    a[i] = s / 4294967296 - 0.5;
  }
}

function runsFor(nx: number, ny: number, quick: boolean): number {
  if (quick) return 3;
  return nx * ny >= 4096 * 4096 ? 5 : 11;
}

/** Warm-up calls before timing: V8 optimises JS and tiers wasm up during the first one or two calls. */
const WARM_UP = 3;

/** Median wall-clock and process-CPU seconds of `runs` calls of `roundTrip` after WARM_UP warm-up calls. */
function timeRoundTrip(roundTrip: () => void, runs: number): { wall: number; cpu: number } {
  for (let w = 0; w < WARM_UP; w++) roundTrip();
  const times: number[] = [];
  const cpu: number[] = [];
  for (let r = 0; r < runs; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    roundTrip();
    times.push((performance.now() - t0) / 1000);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1e6);
  }
  return { wall: median(times), cpu: median(cpu) };
}

/** Time the float64 and float32 round trips; `quick` skips 4096² and uses 3 runs. */
export async function benchFft(options: { quick?: boolean } = {}): Promise<FftBenchRow[]> {
  const quick = options.quick ?? false;
  const rows: FftBenchRow[] = [];
  for (const [nx, ny] of SHAPES) {
    if (quick && nx * ny > 2048 * 2048) continue;
    const runs = runsFor(nx, ny, quick);
    {
      const plan = getRfft2Plan(nx, ny);
      const map = new Float64Array(nx * ny);
      fillRandom(map, 1);
      const spec = new Float64Array(plan.layout.spectrumLength);
      const back = new Float64Array(nx * ny);
      const t = timeRoundTrip(() => {
        plan.forward(map, spec);
        plan.inverse(spec, back);
      }, runs);
      rows.push({ backend: "f64", nx, ny, roundTripSeconds: t.wall, roundTripCpuSeconds: t.cpu, runs });
    }
    try {
      const plan = await createRfft2PlanFloat32(nx, ny);
      const map = new Float32Array(nx * ny);
      fillRandom(map, 1);
      const spec = new Float32Array(plan.layout.spectrumLength);
      const back = new Float32Array(nx * ny);
      const t = timeRoundTrip(() => {
        plan.forward(map, spec);
        plan.inverse(spec, back);
      }, runs);
      plan.dispose();
      rows.push({ backend: "f32", nx, ny, roundTripSeconds: t.wall, roundTripCpuSeconds: t.cpu, runs });
    } catch {
      // the float32 path does not take this shape (pffft size rules): no row
    }
  }
  return rows;
}

/** Memory of six bands transformed in turn (all figures in MiB, 2^20 bytes). */
export interface SixBandMemory {
  /** Resident set size after the modules loaded, before the plan and the maps exist. */
  baselineRssMB: number;
  /** The process's peak resident set size (high-water mark, includes the baseline). */
  peakRssMB: number;
  /** peak − baseline: the data memory, what the floor is about. */
  dataMB: number;
  /** Six maps of n² float64. */
  mapsMB: number;
  /** Two band buffers: two half spectra of n·(n/2+1) complex float64. */
  twoBandBuffersMB: number;
  /** Whether dataMB ≤ mapsMB + twoBandBuffersMB (the issue #2 floor). */
  withinFloor: boolean;
}

const MiB = 2 ** 20;

/**
 * Six n² float64 bands each transformed forward and back in turn with one spectrum buffer and one
 * plan: baseline RSS (after module load), peak RSS, and their difference (the data memory), against
 * the floor "maps plus two band buffers". Run it in a fresh process: the peak is a high-water mark.
 */
export function benchSixBandMemory(n = 4096): SixBandMemory {
  const baselineRssMB = process.memoryUsage().rss / MiB;
  const plan = getRfft2Plan(n, n);
  const bands: Float64Array[] = [];
  for (let b = 0; b < 6; b++) {
    const m = new Float64Array(n * n);
    fillRandom(m, b + 1);
    bands.push(m);
  }
  const spec = new Float64Array(plan.layout.spectrumLength);
  for (const m of bands) {
    plan.forward(m, spec);
    plan.inverse(spec, m);
  }
  const peakRssMB = process.resourceUsage().maxRSS / 1024;
  const mapsMB = (6 * n * n * 8) / MiB;
  const twoBandBuffersMB = (2 * n * (Math.floor(n / 2) + 1) * 16) / MiB;
  const dataMB = peakRssMB - baselineRssMB;
  return { baselineRssMB, peakRssMB, dataMB, mapsMB, twoBandBuffersMB, withinFloor: dataMB <= mapsMB + twoBandBuffersMB };
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  // --memory measures only the memory (in this fresh process, so the peak is the six bands' own)
  const out: Record<string, unknown> = process.argv.includes("--memory")
    ? { sixBands4096: benchSixBandMemory() }
    : { rows: await benchFft({ quick: process.argv.includes("--quick") }) };
  console.log(JSON.stringify(out, null, 1));
}
