/**
 * Benchmark of the blind search (`umbra search`'s filter): one invented 6-band field of
 * 2048 × 2048 pixels (0.5 arcmin) with CMB, correlated atmosphere, white noise and a few hundred
 * clusters, searched at 15 sizes (0.5–10 arcmin) with the default two cleaning passes. Reports
 * wall time and the process's peak resident memory (process.resourceUsage().maxRSS).
 *
 * Run: `npx tsx tests/bench/search.ts [--quick]` (prints JSON; --quick: 512 × 512).
 */
import { pathToFileURL } from "node:url";
import { parseScenario, simulateField } from "../../packages/simulate/src/index.js";
import { a10ProfileShape, searchClusters, stackSedProvider } from "../../packages/estimators/src/index.js";
import { stackFromSimulatedField } from "../../packages/cli/src/commands/regress.js";

function scenario(n: number): unknown {
  const band = (name: string, f: number, fwhm: number, noise: number, knee?: number) => ({
    name, frequencyGHz: f, beamFwhmArcmin: fwhm, unit: "uK_CMB", noiseUKArcmin: noise, ...(knee ? { atmosphere: { ellKnee: knee, slope: -3.5 } } : {}),
  });
  return {
    name: "bench-search",
    field: { nx: n, ny: n, pixelArcmin: 0.5, projection: "CAR", centerDeg: [120, -5], fieldId: "BENCH-SEARCH" },
    bands: [band("f030", 30, 7, 60), band("f090", 90, 2.2, 15, 1000), band("f150", 150, 1.4, 15, 1500), band("f220", 220, 1.0, 40, 2500), band("f280", 280, 0.9, 80), band("f350", 350, 0.8, 250)],
    atmosphereCorrelation: 0.8,
    sky: { cmb: { spectrum: "lcdm2018" }, clusters: { massFunction: { mMinMsun: 3e14, mMaxMsun: 3e15, zMin: 0.05, zMax: 1.5 }, scatterLnY: 0.2, relativistic: false } },
  };
}

/** Run the benchmark; returns one JSON-able row. */
export function benchSearch(quick: boolean): Record<string, unknown> {
  const n = quick ? 512 : 2048;
  const field = simulateField(parseScenario(scenario(n), "bench-search"), 2027);
  const stack = stackFromSimulatedField(field);
  const profile = a10ProfileShape();
  const t0 = performance.now();
  const res = searchClusters(stack, { profile, tszSed: stackSedProvider(stack).tsz(0) });
  const seconds = (performance.now() - t0) / 1000;
  return {
    name: "umbra search, 15 sizes, 2 cleaning passes",
    pixels: `${n}x${n}`,
    bands: 6,
    trueClusters: field.clusters.length,
    candidates: res.candidates.length,
    seconds,
    peakRssMB: Math.round(process.resourceUsage().maxRSS / 1024),
  };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  process.stdout.write(`${JSON.stringify(benchSearch(process.argv.includes("--quick")), null, 2)}\n`);
}
