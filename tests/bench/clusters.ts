/**
 * Benchmark of @umbra/clusters: one angular-diameter distance, building the A10 Fourier table,
 * filter templates for 10^4 cluster sizes (profileFourierAtEll over 2048 multipoles each), a
 * 512-point projected profile, and 1000 Y → M500 inversions.
 *
 * Run: `npx tsx tests/bench/clusters.ts [--quick]` (prints JSON rows), or import `benchClusters`.
 * Timings are medians over several runs after one warm-up.
 */
import { pathToFileURL } from "node:url";
import {
  cosmologyPreset,
  fourierShape,
  gnfwA10,
  m500FromY,
  planck2014YmRelation,
  profileFourierAtEll,
  projectedShape,
} from "../../packages/clusters/src/index.js";
import { timeRuns, type RateBenchRow } from "./timing.js";

export type ClustersBenchRow = RateBenchRow;



/** Run the cluster-model benchmarks; `quick` uses fewer runs and items. */
export async function benchClusters(options: { quick?: boolean } = {}): Promise<ClustersBenchRow[]> {
  const quick = options.quick ?? false;
  const runs = quick ? 3 : 7;
  const rows: ClustersBenchRow[] = [];

  for (const name of ["concordance", "cmb2018"] as const) {
    const c = cosmologyPreset(name);
    const n = quick ? 200 : 2000;
    const t = timeRuns(runs, () => {
      for (let i = 0; i < n; i++) c.angularDiameterDistanceMpc(0.05 + (2 * i) / n);
    });
    rows.push({ name: `D_A(z) single calls, ${name}`, secondsPerRun: t, runs, perSecond: n / t, items: n });
  }

  // a fresh profile object per run defeats the table cache (its key differs by the mass factor)
  let k = 0;
  const tBuild = timeRuns(quick ? 1 : 3, () => {
    fourierShape(gnfwA10({ m500Msun: 3e14 + ++k }));
  }, false);
  rows.push({ name: "A10 Fourier table build (640 nodes, q <= 1000)", secondsPerRun: tBuild, runs: quick ? 1 : 3 });

  const shape = fourierShape(gnfwA10());
  const nEll = 2048;
  const ells = new Float64Array(nEll);
  for (let i = 0; i < nEll; i++) ells[i] = 10 + i * 20;
  const out = new Float64Array(nEll);
  const nSizes = quick ? 1000 : 10_000;
  const tTemplates = timeRuns(quick ? 1 : 3, () => {
    for (let s = 0; s < nSizes; s++) profileFourierAtEll(shape, 1e-4 * (1 + s / 100), ells, out);
  });
  rows.push({ name: `template FTs for ${nSizes} sizes x ${nEll} multipoles`, secondsPerRun: tTemplates, runs: quick ? 1 : 3, perSecond: nSizes / tTemplates, items: nSizes });

  const xs = new Float64Array(512);
  for (let i = 0; i < 512; i++) xs[i] = (5 * i) / 512;
  const tProj = timeRuns(runs, () => {
    projectedShape(gnfwA10(), xs);
  });
  rows.push({ name: "A10 projected profile at 512 radii", secondsPerRun: tProj, runs, perSecond: 512 / tProj, items: 512 });

  const c = cosmologyPreset("concordance");
  const rel = planck2014YmRelation();
  const nInv = quick ? 100 : 1000;
  const tInv = timeRuns(quick ? 1 : 3, () => {
    for (let i = 0; i < nInv; i++) m500FromY({ yArcmin2: 1e-3 * (1 + i / nInv), yErrArcmin2: 2e-4, z: 0.2 + i / nInv, cosmo: c, relation: rel });
  });
  rows.push({ name: `Y -> M500 inversions (fixed Y, with error bounds)`, secondsPerRun: tInv, runs: quick ? 1 : 3, perSecond: nInv / tInv, items: nInv });
  return rows;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  benchClusters({ quick: process.argv.includes("--quick") }).then((rows) => {
    for (const r of rows) process.stdout.write(`${JSON.stringify(r)}\n`);
  });
}
