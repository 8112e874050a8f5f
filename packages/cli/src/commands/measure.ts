/**
 * `umbra measure`: forced photometry of catalogued clusters with the multi-frequency matched
 * filter (@umbra/estimators measureClusters): y0, Y5R500 and their errors, S/N, flags; with
 * `--json` also the size scans, random-position errors, diagnostics and a provenance block.
 *
 * Contract: `umbra measure --bands BANDS.json --catalog CLUSTERS.csv --out RESULTS.csv
 * [--method mmf|ilc] [--json]`; RESULTS.csv starts with the columns
 * id,ra_deg,dec_deg,theta500_arcmin,y0,y0_err,Y5R500_arcmin2,Y5R500_err_arcmin2,snr,flags.
 */
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { resolve } from "node:path";
import type { Command } from "commander";
import { UmbraError } from "@umbra/core";
import {
  a10ProfileShape,
  bandSed,
  clusterPhysics,
  covarianceFromNoiseSimulations,
  loadBandStack,
  measureCatalogByIlc,
  measureClusters,
  stackSedProvider,
  type BandStack,
  type ClusterMeasurement,
  type MeasureOptions,
  type MeasureResult,
} from "@umbra/estimators";
import { readClusterCatalog, writeCsvAtomic, writeTextAtomic, type CsvValue } from "@umbra/maps";
import { VERSION } from "../version.js";

/** Options as commander hands them over. */
interface MeasureCliOptions {
  bands: string;
  catalog: string;
  out: string;
  method: string;
  json?: boolean;
  deproject?: string;
  dustBeta: string;
  dustTemp: string;
  ksz?: boolean;
  relativistic: boolean;
  randoms: string;
  seed: string;
  scanSizes?: string;
  apodisation: string;
  iterations: string;
  cosmology: string;
  relation: string;
  noiseSims?: string;
}

/** The required leading CSV columns (the pipeline contract). */
export const MEASURE_COLUMNS = ["id", "ra_deg", "dec_deg", "theta500_arcmin", "y0", "y0_err", "Y5R500_arcmin2", "Y5R500_err_arcmin2", "snr", "flags"] as const;
/** Further columns after the contract ones. */
export const MEASURE_EXTRA_COLUMNS = [
  "y0_err_random", "theta500_source", "te_kev_used", "v_los_kms", "v_los_err_kms",
  "Y5R500_mpc2", "Y5R500_err_mpc2", "m500_msun", "m500_err_msun", "x_pix", "y_pix",
] as const;

/** Parse a number option or throw BAD_OPTION naming it. */
export function numberOption(name: string, text: string, ok: (v: number) => boolean, why: string): number {
  const v = Number(text);
  if (text.trim() === "" || !Number.isFinite(v) || !ok(v)) throw new UmbraError("BAD_OPTION", `--${name} ${text}: ${why}`, { field: name, value: text });
  return v;
}

/** Parse a comma-separated list of positive numbers (arcmin). */
export function sizesOption(name: string, text: string): number[] {
  const parts = text.split(",").map((s) => s.trim()).filter((s) => s.length > 0);
  if (parts.length === 0) throw new UmbraError("BAD_OPTION", `--${name} needs a comma-separated list of sizes in arcmin`, { field: name });
  return parts.map((p) => numberOption(name, p, (v) => v > 0, "sizes must be positive numbers of arcmin"));
}

/** SEDs of `--deproject cmb,dust` for the stack's bands (dust: modified blackbody at 353 GHz). */
export function deprojectSeds(stack: BandStack, list: string | undefined, dustBeta: number, dustTempK: number): { seds: Float64Array[]; names: string[] } {
  if (list === undefined || list.trim() === "") return { seds: [], names: [] };
  const names = list.split(",").map((s) => s.trim().toLowerCase()).filter((s) => s.length > 0);
  const seds = names.map((n) => {
    if (n === "cmb") return bandSed(stack, { kind: "cmb" });
    if (n === "dust" || n === "cib") return bandSed(stack, { kind: "dust", beta: dustBeta, temperatureK: dustTempK, refFrequencyGHz: 353 });
    throw new UmbraError("BAD_OPTION", `--deproject: unknown component '${n}' (use cmb, dust)`, { field: "deproject", value: n });
  });
  return { seds, names };
}

/** SHA-256 of a file, hex. */
export async function fileSha256(path: string): Promise<string> {
  return createHash("sha256").update(await readFile(path)).digest("hex");
}

/** The JSON path beside a CSV output: RESULTS.csv → RESULTS.json. */
export function jsonPathFor(out: string): string {
  return out.toLowerCase().endsWith(".csv") ? `${out.slice(0, -4)}.json` : `${out}.json`;
}

/** Print a line to stderr when it is a terminal (progress only). */
export function progress(line: string): void {
  if (process.stderr.isTTY) process.stderr.write(`${line}\n`);
}

function row(c: ClusterMeasurement): Record<string, CsvValue> {
  return {
    id: c.id, ra_deg: c.raDeg, dec_deg: c.decDeg, theta500_arcmin: c.theta500Arcmin,
    y0: c.y0, y0_err: c.y0Err, Y5R500_arcmin2: c.yArcmin2, Y5R500_err_arcmin2: c.yErrArcmin2, snr: c.snr,
    flags: c.flags.join("|"),
    y0_err_random: c.y0ErrRandom, theta500_source: c.thetaSource, te_kev_used: c.teKeVUsed,
    v_los_kms: c.vLosKms, v_los_err_kms: c.vLosErrKms, Y5R500_mpc2: c.yMpc2, Y5R500_err_mpc2: c.yErrMpc2,
    m500_msun: c.m500Msun, m500_err_msun: c.m500ErrMsun, x_pix: c.px, y_pix: c.py,
  };
}

/** JSON numbers: NaN/Infinity become null (JSON has no NaN). */
export function jsonSafe(_key: string, v: unknown): unknown {
  return typeof v === "number" && !Number.isFinite(v) ? null : v;
}

async function runMeasure(o: MeasureCliOptions): Promise<void> {
  if (o.method !== "mmf" && o.method !== "ilc") throw new UmbraError("BAD_OPTION", `--method ${o.method}: use mmf or ilc`, { field: "method", value: o.method });
  const dustBeta = numberOption("dust-beta", o.dustBeta, (v) => v > -5 && v < 5, "must be a spectral index between -5 and 5");
  const dustTemp = numberOption("dust-temp", o.dustTemp, (v) => v > 0, "must be a positive temperature in K");
  const randomCount = numberOption("randoms", o.randoms, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0");
  const seed = numberOption("seed", o.seed, Number.isInteger, "must be an integer");
  const apodisation = numberOption("apodisation", o.apodisation, (v) => v >= 0, "must be ≥ 0 arcmin");
  const iterations = numberOption("iterations", o.iterations, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0");
  const scanSizes = o.scanSizes === undefined ? undefined : sizesOption("scan-sizes", o.scanSizes);
  const physics = clusterPhysics(o.cosmology, o.relation);
  progress(`umbra measure: reading ${o.bands}`);
  const stack = await loadBandStack(o.bands);
  for (const w of stack.warnings) process.stderr.write(`umbra: warning: ${w}\n`);
  const catalog = await readClusterCatalog(o.catalog);
  for (const p of catalog.problems) process.stderr.write(`umbra: warning: ${o.catalog}, row ${p.row}, column '${p.column}': ${p.message} (row skipped)\n`);
  const { seds: deproject, names: deprojected } = deprojectSeds(stack, o.deproject, dustBeta, dustTemp);
  let noiseCovariance: MeasureOptions["noiseCovariance"];
  const simInputs: { path: string; sha256: string }[] = [];
  const simPaths = (o.noiseSims ?? "").split(",").map((x) => x.trim()).filter((x) => x.length > 0);
  if (simPaths.length > 0) {
    const sims = [];
    for (const p of simPaths) {
      const sim = await loadBandStack(p);
      simInputs.push(...sim.inputs);
      sims.push(sim);
    }
    noiseCovariance = covarianceFromNoiseSimulations(sims, { apodisationArcmin: apodisation });
  }
  if (o.ksz === true && deprojected.includes("cmb")) {
    throw new UmbraError("BAD_OPTION", "--ksz with --deproject cmb: the kSZ has the CMB's spectrum, so it would be deprojected too", { field: "ksz" });
  }
  progress(`umbra measure: ${catalog.rows.length} clusters, ${stack.bands.length} bands ${stack.nx}×${stack.ny}`);
  const rows = catalog.rows.map((r, k) => ({ id: r.id, raDeg: r.raDeg, decDeg: r.decDeg, theta500Arcmin: r.theta500Arcmin, z: r.z, m500Msun: r.m500Msun, teKeV: r.teKeV, row: k + 1 }));
  if (o.method === "ilc" && (deprojected.length > 0 || o.ksz === true)) {
    throw new UmbraError("BAD_OPTION", "--method ilc takes no --deproject or --ksz here (use umbra ymap for constrained ILC maps, or --method mmf)", { field: "method" });
  }
  const result: { clusters: readonly ClusterMeasurement[]; diagnostics: MeasureResult["diagnostics"] | null } = o.method === "ilc"
    ? { clusters: measureCatalogByIlc(stack, rows, { profile: a10ProfileShape(), physics, randomCount, seed }).clusters, diagnostics: null }
    : measureClusters(
    stack,
    rows,
    {
      profile: a10ProfileShape(),
      seds: stackSedProvider(stack),
      physics,
      deproject,
      fitKsz: o.ksz === true,
      relativistic: o.relativistic,
      ...(scanSizes === undefined ? {} : { scanSizesArcmin: scanSizes }),
      maxIterations: iterations,
      randomCount,
      seed,
      apodisationArcmin: apodisation,
      ...(noiseCovariance === undefined ? {} : { noiseCovariance }),
    },
  );
  await writeCsvAtomic(o.out, [...MEASURE_COLUMNS, ...MEASURE_EXTRA_COLUMNS], result.clusters.map(row));
  if (o.json === true) {
    const inputs = [...stack.inputs, { path: resolve(o.catalog), sha256: await fileSha256(o.catalog) }, ...simInputs];
    const doc = {
      provenance: {
        tool: "umbra",
        version: VERSION,
        command: "measure",
        inputs,
        settings: {
          method: o.method === "ilc" ? "ilc (scale-dependent ILC y map + aperture photometry, @umbra/estimators aperture/)" : "mmf", profile: "gnfw-a10 (Arnaud et al. 2010), truncated at 5 R500", deproject: deprojected,
          dust: { beta: dustBeta, temperatureK: dustTemp, refFrequencyGHz: 353 }, ksz: o.ksz === true, relativistic: o.relativistic,
          randoms: randomCount, seed, scanSizesArcmin: scanSizes ?? "default (15 sizes, 0.5–10 arcmin)", apodisationArcmin: apodisation,
          cleaningIterations: iterations, cosmology: o.cosmology, relation: o.relation, noiseSimulations: simPaths,
        },
      },
      warnings: stack.warnings,
      catalogProblems: catalog.problems,
      diagnostics: result.diagnostics,
      clusters: result.clusters,
    };
    await writeTextAtomic(jsonPathFor(o.out), `${JSON.stringify(doc, jsonSafe, 2)}\n`);
  }
  const ok = result.clusters.filter((c) => Number.isFinite(c.y0)).length;
  progress(`umbra measure: wrote ${o.out} (${ok} of ${result.clusters.length} clusters measured)`);
}

/** Register `umbra measure`. */
export function register(program: Command): void {
  program
    .command("measure")
    .description("Forced photometry of catalogued clusters with the multi-frequency matched filter: y0, Y5R500, errors, S/N.")
    .requiredOption("--bands <manifest.json>", "band manifest (JSON; paths inside are relative to it)")
    .requiredOption("--catalog <clusters.csv>", "cluster catalogue CSV: id,ra_deg,dec_deg required; theta500_arcmin, z, m500_msun, te_kev optional")
    .requiredOption("--out <results.csv>", "output CSV (written atomically)")
    .option("--method <mmf|ilc>", "estimator: mmf (matched multi-frequency filter) or ilc", "mmf")
    .option("--json", "also write <out>.json with size scans, random-position errors, diagnostics and provenance")
    .option("--deproject <list>", "components to null in the filter, comma-separated: cmb, dust (default: none)")
    .option("--dust-beta <beta>", "dust SED spectral index for --deproject dust", "1.6")
    .option("--dust-temp <K>", "dust SED temperature in K for --deproject dust", "20")
    .option("--ksz", "fit kSZ jointly with tSZ and report the line-of-sight velocity (km/s; needs te_kev or z+m500)")
    .option("--no-relativistic", "use the non-relativistic tSZ spectrum even when te_kev or z+m500 are given")
    .option("--randoms <n>", "random positions for the empirical error (0 = none)", "300")
    .option("--seed <n>", "seed of the random positions", "1")
    .option("--scan-sizes <list>", "theta500 values in arcmin scanned when a cluster has none (default: 15 sizes 0.5–10)")
    .option("--apodisation <arcmin>", "width of the edge taper in arcmin", "8")
    .option("--iterations <n>", "cluster-cleaning iterations of the noise covariance", "4")
    .option("--cosmology <name>", "cosmology preset for theta500(M, z), D_A and masses", "cmb2018")
    .option("--relation <name>", "Y–M relation for M500: a10 or planck2014", "a10")
    .option("--noise-sims <manifests>", "comma-separated band manifests of noise-only simulations: their mean covariance replaces the data estimate")
    .action(async (o: MeasureCliOptions) => runMeasure(o));
}
