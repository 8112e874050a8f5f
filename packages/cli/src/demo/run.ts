/**
 * The demo: the main job end to end on a simulated invented field, through the same commands a
 * user runs (`simulate`, `measure`, `search`, `ymap`), then a report folder with figures and a
 * compact table on stdout. Nothing here is canned: every number comes from this run.
 */
import { mkdir, readdir, readFile } from "node:fs/promises";
import { join } from "node:path";
import { UmbraError } from "@umbra/core";
import { cutout, readFitsImage, writeFileAtomic, worldToPixel, type SkyMap } from "@umbra/maps";
import { mapChart, stampGrid, type Figure, type Stamp } from "@umbra/plot";
import { regressionSummary, matchDetections, type RegressionSummary } from "@umbra/simulate";
import type { FilterRadialProfile } from "@umbra/estimators";
import { demoScenario } from "./scenario.js";
import { num, readRows, realisationRecord } from "../report/tables.js";
import { completenessFigure, filterProfileFigure, foregroundSedFigure, pullHistogram, purityFigure, tszSedFigure, yBiasFigure, yMeasuredVsTrue } from "../report/figures.js";
import { writeReport, type ReportInput } from "../report/write.js";

/** Options of {@link runDemo}. */
export interface DemoOptions {
  outDir: string;
  seed: number;
  quick: boolean;
  /** Runs one CLI command (argv without `umbra`), resolving to its exit code. */
  runCommand(argv: readonly string[]): Promise<number>;
  /** Where step headers go (stderr). */
  log(line: string): void;
}

/** What the demo measured (also written to summary.json). */
export interface DemoSummary {
  outDir: string;
  reportPath: string;
  clustersInField: number;
  measured: number;
  summary: RegressionSummary;
  candidates: number;
  falseCandidatesSnr5: number;
  areaDeg2: number;
}

async function step(o: DemoOptions, label: string, argv: readonly string[]): Promise<void> {
  o.log(`demo: ${label}: umbra ${argv.join(" ")}`);
  const t0 = Date.now();
  const code = await o.runCommand(argv);
  if (code !== 0) throw new UmbraError("INTERNAL", `demo step '${label}' failed with exit code ${code}`);
  o.log(`demo: ${label} done in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
}

/** Run the demo and write its outputs under `o.outDir`. */
export async function runDemo(o: DemoOptions): Promise<DemoSummary> {
  const out = o.outDir;
  const field = join(out, "field");
  const snrDir = join(out, "snr");
  await mkdir(out, { recursive: true });
  const scenarioPath = join(out, "scenario.json");
  const scenario = demoScenario(o.quick);
  await writeFileAtomic(scenarioPath, `${JSON.stringify(scenario, null, 2)}\n`);
  const manifest = join(field, "bands.json");
  await step(o, "simulate an invented survey field", ["simulate", "--scenario", scenarioPath, "--seed", String(o.seed), "--out", field]);
  await step(o, "forced photometry at the true positions", ["measure", "--bands", manifest, "--catalog", join(field, "truth_clusters.csv"), "--out", join(out, "measure.csv"), "--json", "--randoms", o.quick ? "60" : "200"]);
  await step(o, "blind search", ["search", "--bands", manifest, "--out", join(out, "candidates.csv"), "--snr-maps", snrDir, "--json", ...(o.quick ? ["--sizes", "1,2,4"] : [])]);
  await step(o, "Compton-y map (constrained ILC, CMB nulled)", ["ymap", "--bands", manifest, "--out", join(out, "ymap.fits"), "--ilc", "constrained", "--deproject", "cmb", "--catalog", join(field, "truth_clusters.csv")]);

  o.log("demo: writing the report");
  const truth = await readRows(join(field, "truth_clusters.csv"));
  const forced = await readRows(join(out, "measure.csv"));
  const candidates = await readRows(join(out, "candidates.csv"));
  const record = realisationRecord(o.seed, truth, forced, candidates);
  const summary = regressionSummary([record], { bootstrapResamples: 100 });
  const match = matchDetections(record.detections, truth.map((t) => ({ id: t.id, raDeg: t.raDeg, decDeg: t.decDeg, yArcmin2: num(t, "y5r500_arcmin2"), snrTrue: 0 })), summary.options.matchRadiusArcmin);
  let false5 = 0;
  record.detections.forEach((d, i) => {
    if (d.snr >= 5 && match.truthOfDetection[i] === -1) false5++;
  });
  const nx = (scenario["field"] as { nx: number }).nx;
  const areaDeg2 = ((nx * 0.5) / 60) ** 2;

  const bands = (scenario["bands"] as { name: string; frequencyGHz: number; unit: string }[]).map((b) => ({ name: b.name, frequencyGHz: b.frequencyGHz, unit: b.unit }));
  const maps: SkyMap[] = [];
  for (const b of bands) maps.push((await readFitsImage(join(field, `${b.name}.fits`))).map);
  const ymap = (await readFitsImage(join(out, "ymap.fits"))).map;
  const snrFiles = (await readdir(snrDir)).filter((f) => f.endsWith(".fits")).sort();
  const snrMax = await maxOverMaps(snrFiles.map((f) => join(snrDir, f)));
  const geomWcs = maps[0]?.wcs ?? null;
  const markers = candidates.map((c) => {
    const p = geomWcs === null ? { ix: num(c, "x_pix"), iy: num(c, "y_pix") } : worldToPixel(geomWcs, c.raDeg, c.decDeg);
    return { ix: p.ix, iy: p.iy, label: num(c, "snr").toFixed(1) };
  });

  const figures: Figure[] = [];
  figures.push(
    mapChart({ name: "y-map", caption: "Compton-y map from the constrained ILC (unit tSZ response, zero CMB response), with blind candidates circled and labelled by raw S/N.", title: "Compton-y map", data: ymap.data, nx: ymap.nx, ny: ymap.ny, pixelArcmin: 0.5, colourbarLabel: "Compton y", markers }),
    mapChart({ name: "snr-map", caption: `Matched-filter S/N, the maximum over the ${snrFiles.length} filter sizes at each pixel, with the blind candidates circled.`, title: "S/N map (max over sizes)", data: snrMax.data, nx: snrMax.nx, ny: snrMax.ny, pixelArcmin: 0.5, colourbarLabel: "S/N", markers }),
  );
  bands.forEach((b, k) => {
    const m = maps[k] as SkyMap;
    figures.push(mapChart({ name: `band-${b.name}`, caption: `Band ${b.name} (${b.frequencyGHz} GHz) as simulated, in its own unit ${b.unit}, with the blind candidates circled.`, title: `${b.name}: ${b.frequencyGHz} GHz`, data: m.data, nx: m.nx, ny: m.ny, pixelArcmin: 0.5, colourbarLabel: `T [${b.unit}]`, markers, displayPx: 320 }));
  });
  figures.push(stampFigure(forced, maps, bands));
  const measureDoc = JSON.parse(await readFile(join(out, "measure.json"), "utf8")) as { diagnostics: { filterProfile: FilterRadialProfile | null } | null };
  const fp = measureDoc.diagnostics?.filterProfile ?? null;
  if (fp !== null) figures.push(filterProfileFigure(fp, bands.map((b) => b.name)));
  figures.push(tszSedFigure(bands), foregroundSedFigure(bands), yMeasuredVsTrue([record]), pullHistogram([record], summary), yBiasFigure(summary), completenessFigure(summary), purityFigure(summary));

  const top = [...forced].filter((r) => Number.isFinite(num(r, "snr"))).sort((a, b) => num(b, "snr") - num(a, "snr")).slice(0, 12);
  const truthById = new Map(truth.map((t) => [t.id, t]));
  const tableRows = top.map((r) => {
    const t = truthById.get(r.id);
    return [r.id, t === undefined ? Number.NaN : num(t, "y5r500_arcmin2"), num(r, "Y5R500_arcmin2"), num(r, "Y5R500_err_arcmin2"), num(r, "snr"), r.extra["flags"] ?? ""];
  });
  const blocks: ReportInput[] = [
    { kind: "paragraph", text: `An invented five-band survey field (HERON-D1, ${areaDeg2.toFixed(1)} deg²) simulated with seed ${o.seed}: CMB, clusters from the Tinker et al. 2008 mass function with A10 profiles and relativistic tSZ, dust/CIB, radio sources, correlated atmosphere and white noise. Then forced photometry at the true positions, a blind search and a constrained-ILC y map — the same commands a user runs. These are scientific estimates on one simulated sky; see the README's caveats.` },
    { kind: "heading", text: "Forced photometry" },
    { kind: "table", columns: ["id", "true Y5R500 [arcmin²]", "measured Y5R500 [arcmin²]", "error [arcmin²]", "S/N", "flags"], rows: tableRows, caption: `The ${top.length} highest-S/N clusters of the ${forced.length} catalogued; all rows are in measure.csv.` },
    { kind: "paragraph", text: `Pulls over ${summary.pulls.n} clusters: mean ${summary.pulls.mean.value.toFixed(2)} ± ${summary.pulls.mean.error.toFixed(2)}, standard deviation ${summary.pulls.std.value.toFixed(2)} ± ${summary.pulls.std.error.toFixed(2)}. One field is a small sample: the regression tests and docs/validation.md use many.` },
    ...figures.filter((f) => ["y-measured-vs-true", "pulls", "y-bias", "stamps", "filter-profile"].includes(f.name)).map((figure) => ({ kind: "figure" as const, figure })),
    { kind: "heading", text: "Blind search" },
    { kind: "paragraph", text: `${candidates.length} candidates with raw S/N ≥ 4.5 (the threshold uses the raw S/N maximised over position and size; the debiased S/N is in candidates.csv). ${false5} candidate(s) with S/N ≥ 5 match no true cluster within ${summary.options.matchRadiusArcmin}′ (${(false5 / areaDeg2 * 10).toFixed(1)} per 10 deg²).` },
    ...figures.filter((f) => ["snr-map", "completeness", "purity"].includes(f.name)).map((figure) => ({ kind: "figure" as const, figure })),
    { kind: "heading", text: "Compton-y map and bands" },
    ...figures.filter((f) => f.name === "y-map" || f.name.startsWith("band-")).map((figure) => ({ kind: "figure" as const, figure })),
    { kind: "heading", text: "Spectra" },
    ...figures.filter((f) => f.name.endsWith("sed") || f.name.endsWith("seds")).map((figure) => ({ kind: "figure" as const, figure })),
  ];
  const reportPath = await writeReport(join(out, "report"), "umbra demo: HERON-D1", blocks);
  const result: DemoSummary = { outDir: out, reportPath, clustersInField: truth.length, measured: forced.filter((r) => Number.isFinite(num(r, "y0"))).length, summary, candidates: candidates.length, falseCandidatesSnr5: false5, areaDeg2 };
  await writeFileAtomic(join(out, "summary.json"), `${JSON.stringify(result, (_k, v: unknown) => (typeof v === "number" && !Number.isFinite(v) ? null : v), 2)}\n`);
  return result;
}

/** Pixel-wise maximum over several maps of one grid (NaN-aware). */
async function maxOverMaps(paths: readonly string[]): Promise<SkyMap> {
  if (paths.length === 0) throw new UmbraError("INTERNAL", "demo: the search wrote no S/N maps");
  const first = (await readFitsImage(paths[0] as string)).map;
  const acc = Float64Array.from(first.data);
  for (const p of paths.slice(1)) {
    const m = (await readFitsImage(p)).map;
    for (let i = 0; i < acc.length; i++) {
      const v = m.data[i] as number;
      if (v > (acc[i] as number) || Number.isNaN(acc[i] as number)) acc[i] = v;
    }
  }
  return { ...first, data: acc };
}

/** Cut-out stamps (16′ square) of the four highest-S/N measured clusters in every band. */
function stampFigure(forced: Awaited<ReturnType<typeof readRows>>, maps: readonly SkyMap[], bands: readonly { name: string; unit: string }[]): Figure {
  const top = [...forced].filter((r) => Number.isFinite(num(r, "snr"))).sort((a, b) => num(b, "snr") - num(a, "snr")).slice(0, 4);
  const stamps: (Stamp | null)[][] = top.map((r) =>
    maps.map((m) => {
      try {
        const c = cutout(m, r.raDeg, r.decDeg, 32, 32);
        return { data: c.data, nx: c.nx, ny: c.ny };
      } catch {
        return null;
      }
    }),
  );
  return stampGrid({
    name: "stamps",
    caption: "16′ × 16′ cut-outs of the four highest-S/N clusters in every band (each stamp with its own colour range, printed below it in the band's unit): the decrement below 217 GHz turns into an increment above.",
    title: "Cluster stamps across bands",
    stamps,
    rowLabels: top.map((r) => `${r.id.replace(/^HERON-D1-/, "")} (S/N ${num(r, "snr").toFixed(0)})`),
    columnLabels: bands.map((b) => `${b.name} [${b.unit}]`),
  });
}
