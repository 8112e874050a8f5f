/**
 * Soak run (child process, started by tests/integration/soak.test.ts with --expose-gc): simulate
 * N small invented fields, run forced photometry and the blind search on each, and print the heap
 * and RSS after a full GC at every iteration as JSON.
 */
import { runRealisation } from "@umbra/cli";
import { parseScenario, simulateField } from "@umbra/simulate";

const n = Number(process.argv[2] ?? "50");
const scenario = parseScenario(
  {
    name: "soak",
    field: { nx: 96, ny: 96, pixelArcmin: 0.75, projection: "TAN", centerDeg: [200, 10], fieldId: "WREN-SOAK" },
    bands: [
      { name: "w090", frequencyGHz: 90, beamFwhmArcmin: 2.2, unit: "uK_CMB", noiseUKArcmin: 10 },
      { name: "w150", frequencyGHz: 150, beamFwhmArcmin: 1.4, unit: "uK_CMB", noiseUKArcmin: 10 },
      { name: "w220", frequencyGHz: 220, beamFwhmArcmin: 1.0, unit: "uK_CMB", noiseUKArcmin: 30 },
    ],
    sky: { cmb: { spectrum: "lcdm2018" }, clusters: { massFunction: { mMinMsun: 2e14, mMaxMsun: 2e15, zMin: 0.1, zMax: 1.2 } } },
  },
  "soak scenario",
);
const gc = (globalThis as { gc?: () => void }).gc;
if (gc === undefined) throw new Error("run with --expose-gc");
const samples: { heapMB: number; rssMB: number; clusters: number }[] = [];
for (let i = 0; i < n; i++) {
  const field = simulateField(scenario, 1000 + i);
  const r = runRealisation(field, { randomCount: 20, maxIterations: 1, searchSizesArcmin: [1, 2, 4] });
  gc();
  const m = process.memoryUsage();
  samples.push({ heapMB: m.heapUsed / 2 ** 20, rssMB: m.rss / 2 ** 20, clusters: r.record.truth.length });
}
process.stdout.write(`${JSON.stringify(samples)}\n`);
