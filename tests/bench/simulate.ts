/**
 * Benchmark of @umbra/simulate: one 6-band field of 2048 × 2048 pixels (0.5 arcmin, 290 deg²) with
 * CMB, a Tinker 2008 cluster population above 3×10¹⁴ M☉ (a few hundred clusters), dust/CIB, radio
 * sources, beams, correlated atmosphere and white noise. Reports wall time and the process's peak
 * resident memory (process.resourceUsage().maxRSS). `--quick` runs a 512 × 512 version.
 *
 * Run: `npx tsx tests/bench/simulate.ts [--quick]` (prints JSON rows), or import `benchSimulate`.
 */
import { pathToFileURL } from "node:url";
import { parseScenario, simulateField } from "../../packages/simulate/src/index.js";

/** One benchmark result. */
export interface SimulateBenchRow {
  name: string;
  seconds: number;
  peakRssMB: number;
  clusters: number;
  radioSources: number;
  pixels: number;
  bands: number;
}

function benchScenario(n: number) {
  const band = (name: string, f: number, fwhm: number, unit: string, noise: number, knee?: number) => ({
    name,
    frequencyGHz: f,
    beamFwhmArcmin: fwhm,
    unit,
    noiseUKArcmin: noise,
    ...(knee ? { atmosphere: { ellKnee: knee, slope: -3.5 } } : {}),
  });
  return parseScenario(
    {
      name: "bench-six-band",
      field: { nx: n, ny: n, pixelArcmin: 0.5, projection: "CAR", centerDeg: [120, -5], fieldId: "BENCH-FIELD" },
      bands: [
        band("f030", 30, 7, "K_CMB", 60),
        band("f090", 90, 2.2, "uK_CMB", 15, 1000),
        band("f150", 150, 1.4, "uK_CMB", 15, 1500),
        band("f220", 220, 1.0, "uK_CMB", 40, 2500),
        band("f280", 280, 0.9, "MJy/sr", 80, 3000),
        band("f350", 350, 0.8, "Jy/beam", 200, 3500),
      ],
      sky: {
        cmb: { spectrum: "lcdm2018" },
        clusters: { massFunction: { mMinMsun: 3e14, mMaxMsun: 3e15, zMin: 0.05, zMax: 1.5 }, velocitySigmaKmS: 300 },
        dust: { refFrequencyGHz: 220, dellAt3000UK2: 60, ellIndex: -1.2, beta: 1.6, temperatureK: 20 },
        radio: { refFrequencyGHz: 150, densityPerDeg2: 3, minFluxJy: 0.002, maxFluxJy: 1, slope: 2.2 },
      },
    },
    "bench",
  );
}

/** Run the simulation benchmark (`quick`: 512² instead of 2048²). */
export async function benchSimulate(options: { quick?: boolean } = {}): Promise<SimulateBenchRow[]> {
  const n = options.quick === true ? 512 : 2048;
  const s = benchScenario(n);
  const t0 = performance.now();
  const f = simulateField(s, 2026);
  const seconds = (performance.now() - t0) / 1000;
  return [
    {
      name: `simulate 6 bands ${n}x${n}`,
      seconds,
      peakRssMB: process.resourceUsage().maxRSS / 1024,
      clusters: f.clusters.length,
      radioSources: f.radioSources.length,
      pixels: n * n,
      bands: f.bands.length,
    },
  ];
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  benchSimulate({ quick: process.argv.includes("--quick") }).then((rows) => {
    for (const r of rows) process.stdout.write(`${JSON.stringify(r)}\n`);
  });
}
