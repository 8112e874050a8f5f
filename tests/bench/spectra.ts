/**
 * Benchmark of @umbra/spectra: the exact relativistic tSZ integral for one (frequency, kTe) pair,
 * the fast evaluator's throughput on random pairs over 10 GHz–1 THz × 0–50 keV, and building a
 * 6-band tSZ mixing vector for 10^4 clusters of different kTe (delta bands and tabulated bands).
 *
 * Run: `npx tsx tests/bench/spectra.ts [--quick]` (prints JSON rows), or import `benchSpectra`.
 * Timings are medians over several runs after one warm-up.
 */
import { pathToFileURL } from "node:url";
import {
  componentResponse,
  createFastRelativisticTsz,
  createTszBandResponse,
  tszResponseRelativistic,
} from "../../packages/spectra/src/index.js";
import type { BandSpec } from "../../packages/spectra/src/index.js";
import { timeRuns, type RateBenchRow } from "./timing.js";

export type SpectraBenchRow = RateBenchRow;



function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

function topHat(centre: number, frac: number, n: number): BandSpec {
  const f = new Float64Array(n);
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    f[i] = centre * (1 - frac / 2 + (frac * i) / (n - 1));
    w[i] = i === 0 || i === n - 1 ? 0 : 1;
  }
  return { bandpass: { frequencyGHz: f, weight: w } };
}

/** Run the spectra benchmarks; `quick` uses fewer runs and pairs. */
export async function benchSpectra(options: { quick?: boolean } = {}): Promise<SpectraBenchRow[]> {
  const quick = options.quick ?? false;
  const runs = quick ? 3 : 9;
  const rows: SpectraBenchRow[] = [];

  // a new kTe every call, so the scattering kernel is rebuilt (the exact evaluator reuses the last one)
  let kteStep = 0;
  const tExact = timeRuns(runs, () => {
    tszResponseRelativistic(353, 12.5 + 1e-3 * kteStep++);
  });
  rows.push({ name: "exact relativistic tSZ, one (frequency, kTe) pair, new kTe", secondsPerRun: tExact, runs, perSecond: 1 / tExact, items: 1 });
  let fStep = 0;
  const tExactSame = timeRuns(runs, () => {
    tszResponseRelativistic(353 + 1e-3 * fStep++, 12.5);
  });
  rows.push({ name: "exact relativistic tSZ, another frequency at the same kTe", secondsPerRun: tExactSame, runs, perSecond: 1 / tExactSame, items: 1 });

  const nPairs = quick ? 200_000 : 1_000_000;
  const rnd = lcg(1);
  const f = Float64Array.from({ length: nPairs }, () => 10 + 990 * rnd());
  const t = Float64Array.from({ length: nPairs }, () => 50 * rnd());
  const out = new Float64Array(nPairs);
  const fast = createFastRelativisticTsz();
  const tFast = timeRuns(runs, () => {
    fast.responseMany(f, t, out);
  });
  rows.push({ name: "fast relativistic tSZ, random pairs (responseMany)", secondsPerRun: tFast, runs, perSecond: nPairs / tFast, items: nPairs });

  const nClusters = 10_000;
  const kte = Float64Array.from({ length: nClusters }, () => 1 + 14 * rnd());
  const freqs = [30, 90, 150, 220, 280, 350];
  const deltaBands: BandSpec[] = freqs.map((g) => ({ frequencyGHz: g }));
  const tabBands: BandSpec[] = freqs.map((g) => topHat(g, 0.25, 101));
  const mix = new Float64Array(nClusters * 6);
  for (const [label, bands] of [
    ["delta", deltaBands],
    ["101-sample tabulated", tabBands],
  ] as const) {
    const tBuild = timeRuns(runs, () => {
      const ev = bands.map((b) => createTszBandResponse(b, "K_CMB"));
      for (let c = 0; c < nClusters; c++) {
        const k = kte[c] as number;
        for (let b = 0; b < 6; b++) mix[c * 6 + b] = (ev[b] as ReturnType<typeof createTszBandResponse>).response(k);
      }
    });
    rows.push({ name: `6-band tSZ mixing vectors for 10^4 clusters, ${label} bands (createTszBandResponse)`, secondsPerRun: tBuild, runs, perSecond: nClusters / tBuild, items: nClusters });
  }
  const tGeneric = timeRuns(quick ? 1 : 3, () => {
    for (let c = 0; c < nClusters; c++) {
      for (let b = 0; b < 6; b++) mix[c * 6 + b] = componentResponse({ kind: "tsz", kTeKeV: kte[c] as number }, deltaBands[b] as BandSpec, "K_CMB");
    }
  });
  rows.push({ name: "6-band tSZ mixing vectors for 10^4 clusters, delta bands (componentResponse)", secondsPerRun: tGeneric, runs: quick ? 1 : 3, perSecond: nClusters / tGeneric, items: nClusters });
  return rows;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  benchSpectra({ quick: process.argv.includes("--quick") }).then((rows) => {
    for (const r of rows) process.stdout.write(`${JSON.stringify(r)}\n`);
  });
}
