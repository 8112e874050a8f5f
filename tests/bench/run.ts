/**
 * `npm run bench`: every benchmark, each in its own child process (so peak-memory figures are the
 * section's own), then `docs/benchmarks.md` rewritten with the machine described and one table per
 * section. Run it on a quiet machine; figures from a loaded machine are not worth recording.
 *
 *   npm run bench                 all sections, full size
 *   npm run bench -- --quick      small sizes (a smoke run; does not rewrite docs/benchmarks.md)
 *   npm run bench -- fft fits     only the named sections (does not rewrite docs/benchmarks.md)
 */
import { spawnSync } from "node:child_process";
import { cpus, totalmem, release } from "node:os";
import { fileURLToPath, pathToFileURL } from "node:url";
import { writeFileSync, renameSync } from "node:fs";

type Row = Record<string, unknown>;

/** One benchmark section: how to run it in a child process and what it measures. */
interface Section {
  name: string;
  title: string;
  what: string;
  /** Runs inside the child; returns rows. */
  run(quick: boolean): Promise<Row[]>;
}

const SECTIONS: Section[] = [
  {
    name: "fft",
    title: "Real 2-D FFT round trip (forward + inverse) against numpy",
    what: "Seconds per rfft2 + irfft2 round trip on random maps: umbra (`tests/bench/fft.ts`) and numpy (`python3 tests/bench/fft_numpy.py`) each timed in two passes, alternating (umbra, numpy, umbra, numpy), each pass the median of 11 round trips (5 at 4096²) after three warm-up calls; each side keeps its faster pass, so a burst of load from other processes during one pass does not decide the ratio. ratio = umbra / numpy; floor: the issue #2 target (≤ 2.0 float64, ≤ 0.8 float32). docs/fft.md has medians over several runs.",
    async run(quick) {
      const { benchFft } = await import("./fft.js");
      type NpRow = { nx: number; ny: number; roundTripSeconds: number };
      const passes = quick ? 1 : 2;
      let rows: Row[] = [];
      const npPasses: { library?: string; rows: NpRow[] }[] = [];
      for (let p = 0; p < passes; p++) {
        const ours = (await benchFft({ quick })) as unknown as Row[];
        rows = p === 0 ? ours : rows.map((r, i) => (((ours[i] as Row)["roundTripSeconds"] as number) < (r["roundTripSeconds"] as number) ? (ours[i] as Row) : r));
        const py = spawnSync("python3", [fileURLToPath(new URL("./fft_numpy.py", import.meta.url)), ...(quick ? ["--quick"] : [])], { encoding: "utf8" });
        if (py.status === 0) npPasses.push(JSON.parse(py.stdout) as { library?: string; rows: NpRow[] });
      }
      const first = npPasses[0];
      if (first === undefined) return rows.map((r) => ({ ...r, numpySeconds: "numpy unavailable" }));
      // numpy's faster pass per shape
      const ref0 = { library: first.library, rows: first.rows.map((q, i) => npPasses.map((n) => n.rows[i] as NpRow).reduce((a, b) => (b.roundTripSeconds < a.roundTripSeconds ? b : a), q)) };
      return rows.map((r) => {
        const ref = ref0.rows.find((q) => q.nx === r["nx"] && q.ny === r["ny"]);
        const s = r["roundTripSeconds"] as number;
        const ratio = ref === undefined ? null : s / ref.roundTripSeconds;
        const floor = r["backend"] === "f64" ? 2.0 : 0.8; // issue #2: f64 ≤ 2.0× numpy, f32 ≤ 0.8×
        return { ...r, passes, numpySeconds: ref?.roundTripSeconds ?? null, ratio, floor, withinFloor: ratio === null ? null : ratio <= floor, reference: ref0.library ?? "" };
      });
    },
  },
  {
    name: "fft-memory",
    title: "Memory of six 4096² float64 bands transformed in turn",
    what: "Six 4096² maps held (768 MiB) while each is transformed forward and back with one reused spectrum buffer and one plan. baselineRssMB: resident memory after the modules (or numpy) loaded, before any map exists; peakRssMB: the process's high-water mark; dataMB = peak − baseline, the data memory. The floor (issue #2) is about dataMB: at most the maps plus two band buffers (mapsMB + twoBandBuffersMB). numpy does the same in its own process (`fft_numpy.py --memory`), each band's spectrum dropped before the next. All in MiB.",
    async run(quick) {
      const { benchSixBandMemory } = await import("./fft.js");
      const n = quick ? 1024 : 4096;
      const ours = benchSixBandMemory(n);
      const rows: Row[] = [{ program: "umbra (float64 plan, one spectrum buffer)", ...ours }];
      if (!quick) {
        const py = spawnSync("python3", [fileURLToPath(new URL("./fft_numpy.py", import.meta.url)), "--memory"], { encoding: "utf8" });
        if (py.status === 0) {
          const np = JSON.parse(py.stdout) as { library?: string; sixBands4096?: { baselineRssMB: number; peakRssMB: number; dataMB: number } };
          const m = np.sixBands4096;
          rows.push({
            program: `${np.library ?? "numpy"} (rfft2/irfft2, one band's spectrum alive at a time)`,
            baselineRssMB: m?.baselineRssMB ?? null,
            peakRssMB: m?.peakRssMB ?? null,
            dataMB: m?.dataMB ?? null,
            mapsMB: ours.mapsMB,
            twoBandBuffersMB: ours.twoBandBuffersMB,
            withinFloor: m === undefined ? null : m.dataMB <= ours.mapsMB + ours.twoBandBuffersMB,
          });
        }
      }
      return rows;
    },
  },
  {
    name: "fits",
    title: "Reading uncompressed float32 FITS images against astropy",
    what: "Median milliseconds per read of a 2048² and a 4096² float32 image in the page cache. umbra's float32 path (`dtype: \"float32\"`, native-order Float32Array) is compared with astropy's `fits.open(memmap=False)` + `.data` (big-endian float32, no conversion), umbra's float64 path (the default) with `.data.astype(float64)`. Like for like in two memory regimes: recycled (astropy drops each array and glibc hands its pages to the next read; umbra reads into a reused `out`) and fresh (every array kept, so each read writes pages never touched before, on both sides). The third row per type, fresh arrays dropped, is the same loop in Node, where V8 frees dropped arrays only at its next garbage collection. Issue #2's floor: ratio ≤ 1 on the like-for-like float32 rows (`likeForLike`). docs/fits-reader.md explains the regimes.",
    async run(quick) {
      const { benchFitsRead } = await import("./fits-read.js");
      return (await benchFitsRead({ quick })) as unknown as Row[];
    },
  },
  {
    name: "spectra",
    title: "Spectral responses",
    what: "Exact relativistic tSZ (one frequency, kTe pair), the fast evaluator's throughput, and 6-band tSZ mixing vectors for 10⁴ clusters of different kTe.",
    async run(quick) {
      const { benchSpectra } = await import("./spectra.js");
      return (await benchSpectra({ quick })) as unknown as Row[];
    },
  },
  {
    name: "clusters",
    title: "Cluster models",
    what: "Distances, profile projection, Fourier-template tables and Y→M inversions.",
    async run(quick) {
      const { benchClusters } = await import("./clusters.js");
      return (await benchClusters({ quick })) as unknown as Row[];
    },
  },
  {
    name: "simulate",
    title: "Simulating a multi-band field",
    what: "Wall time and peak RSS of `simulateField` for a 6-band field with clusters, CMB, dust/CIB, radio sources and noise.",
    async run(quick) {
      const { benchSimulate } = await import("./simulate.js");
      return (await benchSimulate({ quick })) as unknown as Row[];
    },
  },
  {
    name: "measure",
    title: "Forced photometry against a plain numpy version of the same filter",
    what: "One 6-band 2048² field with 1000 clusters: umbra's single-pass matched filter and `tests/bench/measure_numpy.py` doing the same pass, timed in the same run; umbra's full default pipeline (cleaning iterations, random positions) reported separately.",
    async run(quick) {
      const { benchMeasure } = await import("./measure.js");
      const rows = benchMeasure(quick, true);
      rows.push({ name: "process peak RSS", peakRssMB: Math.round(process.resourceUsage().maxRSS / 1024) });
      return rows;
    },
  },
  {
    name: "search",
    title: "Blind search",
    what: "A 15-size blind search of a 6-band 2048² field: wall time and the process's peak RSS (aim below 3 GB).",
    async run(quick) {
      const { benchSearch } = await import("./search.js");
      return [benchSearch(quick)];
    },
  },
  {
    name: "workers",
    title: "Worker-thread speed-up (regression realisations)",
    what: "`umbra regress` of the deep-small-field scenario (256², 3 bands) with 12 realisations (quick: 2), run in one thread and on 2 worker threads; both write identical files. Speed-up = one-thread time ÷ pool time (worker start-up, about 2 s per thread, included).",
    async run(quick) {
      const { run } = await import("../../packages/cli/src/main.js");
      const { mkdtempSync, rmSync } = await import("node:fs");
      const { tmpdir } = await import("node:os");
      const { join } = await import("node:path");
      const scenario = fileURLToPath(new URL("../../fixtures/scenarios/deep-small-field.json", import.meta.url));
      const n = quick ? "2" : "12";
      const dir = mkdtempSync(join(tmpdir(), "umbra-bench-workers-"));
      const rows: Row[] = [];
      try {
        let base = 0;
        for (const workers of [0, 2]) {
          const t0 = performance.now();
          const code = await run(["regress", "--scenario", scenario, "--realisations", n, "--seed", "1", "--randoms", "100", "--workers", String(workers), "--out", join(dir, `w${workers}`)]);
          const seconds = (performance.now() - t0) / 1000;
          if (code !== 0) throw new Error(`regress exited ${code}`);
          if (workers === 0) base = seconds;
          rows.push({ threads: workers === 0 ? "1 (in process)" : `${workers} workers`, realisations: Number(n), seconds, speedUp: base / seconds });
        }
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
      return rows;
    },
  },
  {
    name: "threads",
    title: "Worker-thread speed-up (forced photometry and blind search)",
    what: "`umbra measure` (truth catalogue, masses) and `umbra search` (15 sizes) of the invented 1024² three-band deep field (deep-1024-timing scenario; quick: 256²), whole map and in sky tiles, each with `--workers 1` and `--workers 2`; the two write identical files (checked). Speed-up = one-thread time ÷ this time, thread start-up included. A tile's fits cost less than the whole map's (fewer Fourier modes per fit), so tiled one-thread runs can be faster than whole-map ones; tile results differ slightly from whole-map ones (each tile has its own covariance). The serial parts (band transforms, covariance estimates, bank building, point-source detection, thread start-up) bound the speed-up.",
    async run(quick) {
      const { benchThreads } = await import("./threads.js");
      return (await benchThreads({ quick })) as unknown as Row[];
    },
  },
];

function fmt(v: unknown): string {
  if (typeof v === "number") {
    if (!Number.isFinite(v)) return String(v);
    if (Number.isInteger(v)) return String(v);
    const a = Math.abs(v);
    return a !== 0 && (a < 1e-3 || a >= 1e6) ? v.toExponential(3) : Number(v.toPrecision(4)).toString();
  }
  if (v === null || v === undefined) return "—";
  if (typeof v === "object") return JSON.stringify(v);
  return String(v).replace(/\|/g, "\\|");
}

function table(rows: Row[]): string {
  const cols: string[] = [];
  for (const r of rows) for (const k of Object.keys(r)) if (!cols.includes(k)) cols.push(k);
  const head = `| ${cols.join(" | ")} |\n| ${cols.map(() => "---").join(" | ")} |`;
  return `${head}\n${rows.map((r) => `| ${cols.map((c) => fmt(r[c])).join(" | ")} |`).join("\n")}`;
}

function machine(): string {
  const c = cpus();
  const np = spawnSync("python3", ["-c", "import numpy; print(numpy.__version__)"], { encoding: "utf8" });
  const ap = spawnSync("/usr/bin/python3", ["-c", "import astropy; print(astropy.__version__)"], { encoding: "utf8" });
  return [
    `- CPU: ${c.length} × ${c[0]?.model ?? "unknown"}`,
    `- memory: ${(totalmem() / 2 ** 30).toFixed(1)} GiB; Linux ${release()}`,
    `- Node ${process.version}; numpy ${np.status === 0 ? np.stdout.trim() : "n/a"} (python3); astropy ${ap.status === 0 ? ap.stdout.trim() : "n/a"} (Debian)`,
  ].join("\n");
}

async function child(name: string, quick: boolean): Promise<void> {
  const s = SECTIONS.find((x) => x.name === name);
  if (s === undefined) throw new Error(`unknown section ${name}`);
  const rows = await s.run(quick);
  process.stdout.write(`\n@@ROWS@@${JSON.stringify(rows)}\n`);
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const ci = args.indexOf("--child");
  const quick = args.includes("--quick");
  if (ci >= 0) return child(args[ci + 1] ?? "", quick);
  const wanted = args.filter((a) => !a.startsWith("--"));
  const chosen = wanted.length === 0 ? SECTIONS : SECTIONS.filter((s) => wanted.includes(s.name));
  const self = fileURLToPath(import.meta.url);
  const parts: string[] = [];
  for (const s of chosen) {
    process.stderr.write(`bench: ${s.name} …\n`);
    const t0 = Date.now();
    const r = spawnSync(process.execPath, ["--import", "tsx", self, "--child", s.name, ...(quick ? ["--quick"] : [])], {
      encoding: "utf8",
      maxBuffer: 64 * 2 ** 20,
      env: { ...process.env },
    });
    const marker = r.stdout.lastIndexOf("@@ROWS@@");
    let body: string;
    if (r.status !== 0 || marker < 0) {
      body = `**Failed** (exit ${String(r.status)}): \`${(r.stderr || r.stdout).trim().split("\n").slice(-3).join(" / ")}\``;
    } else {
      body = table(JSON.parse(r.stdout.slice(marker + 8).trim()) as Row[]);
    }
    process.stderr.write(`bench: ${s.name} done in ${((Date.now() - t0) / 1000).toFixed(1)} s\n`);
    parts.push(`## ${s.title}\n\n${s.what}\n\n${body}\n`);
  }
  const doc = `# Benchmarks

Written by \`npm run bench\` (tests/bench/run.ts) on ${new Date().toISOString().slice(0, 10)}; every figure below is from that one run.
Each section ran in its own process, one after another, on:

${machine()}

Ratios are umbra ÷ reference in the same run (below 1 means umbra is faster). The machine is shared
and noisy: treat single figures as ±20 %. Sections whose bench failed say so.

${parts.join("\n")}`;
  if (quick || wanted.length > 0) {
    process.stdout.write(doc);
    return;
  }
  const out = fileURLToPath(new URL("../../docs/benchmarks.md", import.meta.url));
  writeFileSync(`${out}.tmp`, doc);
  renameSync(`${out}.tmp`, out);
  process.stderr.write(`bench: wrote docs/benchmarks.md\n`);
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await main();
}
