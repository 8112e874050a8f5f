/**
 * The regression report: `regression-summary.json` (the summary object) and `regression-report.html`
 * (four hand-drawn SVG panels with captions and a table), both written atomically.
 */
import { join } from "node:path";
import { mkdir } from "node:fs/promises";
import { writeTextAtomic } from "@umbra/maps";
import { errorPlotSvg } from "./svgPlot.js";
import type { RegressionSummary } from "./summary.js";

function centre(lo: number, hi: number): number {
  return hi > 1e6 ? lo * 1.25 : 0.5 * (lo + hi);
}

function num(v: number, digits = 3): string {
  return Number.isFinite(v) ? v.toPrecision(digits) : "–";
}

/** The HTML page of a summary (pure; used by {@link writeRegressionReport}). */
export function regressionReportHtml(s: RegressionSummary): string {
  const bias = s.yBias.filter((b) => b.n > 0);
  const comp = s.completeness.filter((c) => c.n > 0);
  const pur = s.purity.filter((p) => p.n > 0);
  const panels = [
    errorPlotSvg({
      title: "Y bias against true S/N",
      xLabel: "true S/N (bin centre)",
      yLabel: "(ΣY_meas − ΣY_true)/ΣY_true",
      x: bias.map((b) => centre(b.snrLo, b.snrHi)),
      y: bias.map((b) => b.fractionalBias.value),
      yLo: bias.map((b) => b.fractionalBias.value - b.fractionalBias.error),
      yHi: bias.map((b) => b.fractionalBias.value + b.fractionalBias.error),
      reference: 0,
    }),
    errorPlotSvg({
      title: "Completeness against true S/N",
      xLabel: "true S/N (bin centre)",
      yLabel: `fraction detected at S/N ≥ ${s.options.completenessThreshold}`,
      x: comp.map((c) => centre(c.snrLo, c.snrHi)),
      y: comp.map((c) => c.fraction),
      yLo: comp.map((c) => c.lower),
      yHi: comp.map((c) => c.upper),
      reference: 1,
      yRange: [0, 1.05],
    }),
    errorPlotSvg({
      title: "Purity against detection threshold",
      xLabel: "detection threshold (S/N)",
      yLabel: "fraction of detections matched",
      x: pur.map((p) => p.threshold),
      y: pur.map((p) => p.fraction),
      yLo: pur.map((p) => p.lower),
      yHi: pur.map((p) => p.upper),
      reference: 1,
      yRange: [0, 1.05],
    }),
    errorPlotSvg({
      title: "Mean pull against true S/N",
      xLabel: "true S/N (bin centre)",
      yLabel: "mean (Y_meas − Y_true)/σ_Y",
      x: bias.map((b) => centre(b.snrLo, b.snrHi)),
      y: bias.map((b) => b.meanPull.value),
      yLo: bias.map((b) => b.meanPull.value - b.meanPull.error),
      yHi: bias.map((b) => b.meanPull.value + b.meanPull.error),
      reference: 0,
    }),
  ];
  const captions = [
    "Fractional bias of forced-photometry Y5R500 in bins of true S/N; bars: standard error of the mean difference over the mean true Y.",
    "Fraction of true clusters matched to a blind detection; bars: 68 % Wilson binomial interval.",
    "Fraction of blind detections above each threshold that match a true cluster; bars: 68 % Wilson interval.",
    "Mean pull per true-S/N bin; an unbiased estimator with correct errors gives 0 and an overall pull width of 1.",
  ];
  const rows = s.yBias
    .map((b) => `<tr><td>${num(b.snrLo)}–${b.snrHi > 1e6 ? "∞" : num(b.snrHi)}</td><td>${b.n}</td><td>${num(b.fractionalBias.value)} ± ${num(b.fractionalBias.error, 2)}</td><td>${num(b.meanPull.value)} ± ${num(b.meanPull.error, 2)}</td></tr>`)
    .join("\n");
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>umbra regression report</title>
<style>body{font-family:sans-serif;max-width:920px;margin:1em auto}figure{display:inline-block;margin:6px;width:430px;vertical-align:top}figcaption{font-size:12px;color:#444}table{border-collapse:collapse}td,th{border:1px solid #ccc;padding:2px 8px;text-align:right}</style>
</head><body>
<h1>Regression report</h1>
<p>${s.realisations} realisation(s) (seeds ${s.seeds.join(", ")}); ${s.clustersTotal} true clusters, ${s.detectionsTotal} detections; matching radius ${s.options.matchRadiusArcmin} arcmin.</p>
<p>Pulls: n = ${s.pulls.n}, mean ${num(s.pulls.mean.value)} ± ${num(s.pulls.mean.error, 2)}, standard deviation ${num(s.pulls.std.value)} ± ${num(s.pulls.std.error, 2)}.
Position error of detections at S/N ≥ ${s.options.completenessThreshold}: median ${num(s.position.medianArcmin.value)} ± ${num(s.position.medianArcmin.error, 2)} arcmin, rms ${num(s.position.rmsArcmin.value)} ± ${num(s.position.rmsArcmin.error, 2)} arcmin (bootstrap errors, n = ${s.position.n}).</p>
${panels.map((p, i) => `<figure>${p}<figcaption>${captions[i]}</figcaption></figure>`).join("\n")}
<h2>Y bias by true S/N</h2>
<table><tr><th>true S/N</th><th>n</th><th>fractional bias</th><th>mean pull</th></tr>
${rows}
</table>
</body></html>
`;
}

/** Write `regression-summary.json` and `regression-report.html` into `outDir` (created if needed), atomically. */
export async function writeRegressionReport(summary: RegressionSummary, outDir: string): Promise<{ jsonPath: string; htmlPath: string }> {
  await mkdir(outDir, { recursive: true });
  const jsonPath = join(outDir, "regression-summary.json");
  const htmlPath = join(outDir, "regression-report.html");
  await writeTextAtomic(jsonPath, `${JSON.stringify(summary, null, 2)}\n`);
  await writeTextAtomic(htmlPath, regressionReportHtml(summary));
  return { jsonPath, htmlPath };
}
