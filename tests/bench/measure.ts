/**
 * Benchmark of forced photometry (`umbra measure`'s filter) against a plain numpy version of the
 * same filter (tests/bench/measure_numpy.py), on one invented 6-band field of 2048 × 2048 pixels
 * (0.5 arcmin) with 1000 clusters, CMB, correlated atmosphere and white noise.
 *
 * Both run the same single pass: covariance from the data (beam-deconvolved, adaptive ell bins,
 * [1, 2, 1] smoothing), inverse noise on a fine ell grid, pre-whitening, and one matched-filter
 * fit per cluster at its θ500 (numpy: a direct sum over the Fourier modes; umbra: the same sum taken
 * through rings of equal ℓ, docs/matched-filter.md). umbra's default pipeline adds the
 * cluster-cleaning / joint-fit iterations, random positions and point-source flags; its time is
 * reported separately (`--full`). The two y0 columns are compared as a cross-check.
 *
 * Run: `npx tsx tests/bench/measure.ts [--quick] [--full]` (prints JSON). Needs /usr/bin/python3
 * or python3 with numpy for the comparison (skipped with a note when missing).
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { RAD_PER_ARCMIN } from "../../packages/core/src/index.js";
import { parseScenario, simulateField } from "../../packages/simulate/src/index.js";
import { a10ProfileShape, measureClusters, stackSedProvider, tabulateProfile } from "../../packages/estimators/src/index.js";
import { stackFromSimulatedField } from "../../packages/cli/src/commands/regress.js";

const BANDS = [
  { name: "f030", frequencyGHz: 30, beamFwhmArcmin: 7, unit: "K_CMB", noiseUKArcmin: 60 },
  { name: "f090", frequencyGHz: 90, beamFwhmArcmin: 2.2, unit: "uK_CMB", noiseUKArcmin: 15, atmosphere: { ellKnee: 1000, slope: -3.5 } },
  { name: "f150", frequencyGHz: 150, beamFwhmArcmin: 1.4, unit: "uK_CMB", noiseUKArcmin: 15, atmosphere: { ellKnee: 1500, slope: -3.5 } },
  { name: "f220", frequencyGHz: 220, beamFwhmArcmin: 1.0, unit: "uK_CMB", noiseUKArcmin: 40, atmosphere: { ellKnee: 2500, slope: -3.5 } },
  { name: "f280", frequencyGHz: 280, beamFwhmArcmin: 0.9, unit: "uK_CMB", noiseUKArcmin: 80 },
  { name: "f350", frequencyGHz: 350, beamFwhmArcmin: 0.8, unit: "uK_CMB", noiseUKArcmin: 250 },
];

function scenario(n: number, nClusters: number): unknown {
  const side = Math.ceil(Math.sqrt(nClusters));
  const span = (n * 0.5) / 60; // degrees
  const list = Array.from({ length: nClusters }, (_, k) => {
    const i = k % side;
    const j = Math.floor(k / side);
    return {
      id: `BENCH-C${String(k).padStart(4, "0")}`,
      raDeg: 120 + (((i + 0.5) / side - 0.5) * 0.9 + 0.01 * Math.sin(k)) * span,
      decDeg: -5 + (((j + 0.5) / side - 0.5) * 0.9 + 0.01 * Math.cos(k)) * span,
      m500Msun: 2e14 * (1 + (k % 4)),
      z: 0.2 + 0.1 * (k % 6),
    };
  });
  return {
    name: "bench-measure",
    field: { nx: n, ny: n, pixelArcmin: 0.5, projection: "CAR", centerDeg: [120, -5], fieldId: "BENCH-MEASURE" },
    bands: BANDS,
    atmosphereCorrelation: 0.8,
    sky: { cmb: { spectrum: "lcdm2018" }, clusters: { list, scatterLnY: 0, relativistic: false } },
  };
}

/** Run the benchmark; returns JSON-able rows. */
export function benchMeasure(quick: boolean, full: boolean): Record<string, unknown>[] {
  const n = quick ? 512 : 2048;
  const nClusters = quick ? 100 : 1000;
  const field = simulateField(parseScenario(scenario(n, nClusters), "bench-measure"), 2026);
  const stack = stackFromSimulatedField(field);
  const truth = field.clusters.filter((c) => c.inField);
  const cat = truth.map((c) => ({ id: c.id, raDeg: c.raDeg, decDeg: c.decDeg, theta500Arcmin: c.theta500Arcmin }));
  const seds = stackSedProvider(stack);
  const profile = a10ProfileShape();
  const rows: Record<string, unknown>[] = [];
  let t0 = performance.now();
  const one = measureClusters(stack, cat, { profile, seds, relativistic: false, maxIterations: 0, randomCount: 0, pointSourceSnr: 0 });
  const tOne = (performance.now() - t0) / 1000;
  rows.push({ name: "umbra measure, single pass", pixels: `${n}x${n}`, bands: BANDS.length, clusters: cat.length, seconds: tOne });
  if (full) {
    t0 = performance.now();
    measureClusters(stack, cat, { profile, seds, relativistic: false });
    rows.push({ name: "umbra measure, default pipeline (cleaning + joint fit + randoms + point sources)", seconds: (performance.now() - t0) / 1000 });
  }
  // inputs for numpy: maps (K_CMB), SED, beams, positions, θ500, the profile table
  const dir = mkdtempSync(join(tmpdir(), "umbra-bench-measure-"));
  try {
    const thetaMax = Math.max(...cat.map((c) => c.theta500Arcmin), 10);
    const ellMax = Math.SQRT2 * Math.PI / stack.geometry.dxRad;
    const table = tabulateProfile(profile, ellMax * thetaMax * RAD_PER_ARCMIN * 1.01 + 1);
    const maps = new Float64Array(BANDS.length * n * n);
    stack.bands.forEach((b, i) => maps.set(b.data, i * n * n));
    writeFileSync(join(dir, "maps.f64"), Buffer.from(maps.buffer));
    writeFileSync(join(dir, "table.f64"), Buffer.from(table.g.buffer));
    writeFileSync(join(dir, "meta.json"), JSON.stringify({
      n, pixelRad: stack.geometry.dxRad, fwhmArcmin: BANDS.map((b) => b.beamFwhmArcmin), sed: Array.from(seds.tsz(0)), du: table.du,
      apodisationArcmin: 8, minModes: 200,
      clusters: one.clusters.map((c) => ({ id: c.id, px: c.px, py: c.py, theta500Arcmin: c.theta500Arcmin })),
    }));
    const here = fileURLToPath(new URL(".", import.meta.url));
    let out: string;
    try {
      out = execFileSync("python3", [join(here, "measure_numpy.py"), dir], { encoding: "utf8", maxBuffer: 64 << 20 });
    } catch (e) {
      rows.push({ name: "numpy", error: `numpy run failed: ${(e as Error).message.split("\n")[0]}` });
      return rows;
    }
    const np = JSON.parse(out) as { seconds: number; y0: (number | null)[]; numpy: string };
    rows.push({ name: `numpy ${np.numpy}, same single pass`, seconds: np.seconds });
    let worst = 0;
    one.clusters.forEach((c, k) => {
      const y = np.y0[k];
      if (y == null || !Number.isFinite(c.y0)) return;
      worst = Math.max(worst, Math.abs(c.y0 - y) / c.y0Err);
    });
    rows.push({ name: "cross-check", maxAbsDiffY0InSigma: worst, ratioUmbraOverNumpy: tOne / np.seconds });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return rows;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  const rows = benchMeasure(process.argv.includes("--quick"), process.argv.includes("--full"));
  rows.push({ peakRssMB: Math.round(process.resourceUsage().maxRSS / 1024) });
  process.stdout.write(`${JSON.stringify(rows, null, 2)}\n`);
}
