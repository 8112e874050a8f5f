/**
 * `umbra demo`: the main job on built-in simulated data — an invented survey field simulated,
 * measured at the true positions, searched blind and turned into a y map — with a report folder
 * (`<out>/report/index.html` and its figures) and a compact results table on stdout.
 */
import type { Command } from "commander";
import { UmbraError } from "@umbra/core";
import { runDemo, type DemoSummary } from "../demo/run.js";
import { num, readRows } from "../report/tables.js";
import { join } from "node:path";

interface DemoCliOptions {
  out: string;
  seed: string;
  quick?: boolean;
  json?: boolean;
}

function pad(s: string, n: number): string {
  return s.length >= n ? s : s + " ".repeat(n - s.length);
}

function sci(v: number): string {
  return Number.isFinite(v) ? v.toExponential(2) : "nan";
}

async function printTable(r: DemoSummary): Promise<void> {
  const forced = await readRows(join(r.outDir, "measure.csv"));
  const truth = new Map((await readRows(join(r.outDir, "field", "truth_clusters.csv"))).map((t) => [t.id, t]));
  const top = forced.filter((f) => Number.isFinite(num(f, "snr"))).sort((a, b) => num(b, "snr") - num(a, "snr")).slice(0, 10);
  const lines = [
    `${pad("cluster", 20)} ${pad("Y5R500 true", 12)} ${pad("measured", 10)} ${pad("± error", 10)} ${pad("S/N", 6)} flags`,
    ...top.map((f) => {
      const t = truth.get(f.id);
      return `${pad(f.id, 20)} ${pad(sci(t === undefined ? Number.NaN : num(t, "y5r500_arcmin2")), 12)} ${pad(sci(num(f, "Y5R500_arcmin2")), 10)} ${pad(sci(num(f, "Y5R500_err_arcmin2")), 10)} ${pad(num(f, "snr").toFixed(1), 6)} ${f.extra["flags"] ?? ""}`;
    }),
  ];
  const s = r.summary;
  const comp = s.completeness.filter((b) => b.snrLo >= 5 && b.n > 0);
  const k = comp.reduce((a, b) => a + b.k, 0);
  const n = comp.reduce((a, b) => a + b.n, 0);
  process.stdout.write(
    [
      `umbra demo — invented field HERON-D1, ${r.areaDeg2.toFixed(1)} deg², ${r.clustersInField} simulated clusters (Y5R500 in arcmin²)`,
      "",
      ...lines,
      "",
      `forced photometry: ${r.measured} clusters measured; pulls over ${s.pulls.n} usable: mean ${s.pulls.mean.value.toFixed(2)} ± ${s.pulls.mean.error.toFixed(2)}, std ${s.pulls.std.value.toFixed(2)} ± ${s.pulls.std.error.toFixed(2)}`,
      `blind search: ${r.candidates} candidates (raw S/N ≥ 4.5); found ${k} of ${n} true clusters with true S/N ≥ 5; ${r.falseCandidatesSnr5} unmatched candidate(s) at S/N ≥ 5`,
      `report: ${r.reportPath}`,
      "",
    ].join("\n"),
  );
}

/** Register `umbra demo`. */
export function register(program: Command): void {
  program
    .command("demo")
    .description("Run the main job on a simulated invented survey field: simulate, measure, search, y map, report.")
    .option("--out <dir>", "output folder (created; existing files in it are replaced)", "umbra-demo")
    .option("--seed <n>", "random seed of the simulated sky (integer)", "2026")
    .option("--quick", "a smaller field and fewer filter sizes (for tests)")
    .option("--json", "print the summary as JSON instead of the table")
    .action(async (o: DemoCliOptions) => {
      const seed = Number(o.seed);
      if (!Number.isInteger(seed)) throw new UmbraError("BAD_OPTION", `--seed ${o.seed}: must be an integer`, { field: "seed" });
      const { run } = await import("../main.js");
      const result = await runDemo({
        outDir: o.out,
        seed,
        quick: o.quick === true,
        runCommand: run,
        log: (line) => process.stderr.write(`${line}\n`),
      });
      if (o.json === true) process.stdout.write(`${JSON.stringify(result.summary, (_k, v: unknown) => (typeof v === "number" && !Number.isFinite(v) ? null : v), 2)}\n`);
      else await printTable(result);
    });
}
