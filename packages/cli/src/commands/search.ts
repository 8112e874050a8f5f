/**
 * `umbra search`: blind cluster search with the multi-frequency matched filter at a grid of sizes
 * (@umbra/estimators searchClusters). Candidates above `--snr-min` (raw S/N, maximised over
 * position and size) go to a CSV with raw and debiased S/N; `--snr-maps DIR` writes each size's
 * S/N map as FITS; `--json` writes diagnostics and provenance beside the CSV.
 */
import { mkdir } from "node:fs/promises";
import { join } from "node:path";
import type { Command } from "commander";
import { a10ProfileShape, loadBandStack, searchClusters, stackSedProvider, type Candidate } from "@umbra/estimators";
import { writeCsvAtomic, writeSkyMapFits, writeTextAtomic, type CsvValue } from "@umbra/maps";
import { VERSION } from "../version.js";
import { deprojectSeds, jsonPathFor, jsonSafe, numberOption, progress, sizesOption } from "./measure.js";

interface SearchCliOptions {
  bands: string;
  out: string;
  snrMin: string;
  sizes?: string;
  snrMaps?: string;
  deproject?: string;
  dustBeta: string;
  dustTemp: string;
  apodisation: string;
  iterations: string;
  json?: boolean;
}

/** CSV columns of the candidate list. */
export const SEARCH_COLUMNS = [
  "id", "ra_deg", "dec_deg", "pos_err_arcmin", "theta500_arcmin", "theta500_lo_arcmin", "theta500_hi_arcmin",
  "y0", "y0_err", "Y5R500_arcmin2", "Y5R500_err_arcmin2", "snr", "snr_debiased", "x_pix", "y_pix",
] as const;

function row(c: Candidate): Record<string, CsvValue> {
  return {
    id: c.id, ra_deg: c.raDeg, dec_deg: c.decDeg, pos_err_arcmin: c.positionErrArcmin,
    theta500_arcmin: c.theta500Arcmin, theta500_lo_arcmin: c.theta500LoArcmin, theta500_hi_arcmin: c.theta500HiArcmin,
    y0: c.y0, y0_err: c.y0Err, Y5R500_arcmin2: c.yArcmin2, Y5R500_err_arcmin2: c.yErrArcmin2,
    snr: c.snrRaw, snr_debiased: c.snrDebiased, x_pix: c.px, y_pix: c.py,
  };
}

async function runSearch(o: SearchCliOptions): Promise<void> {
  const snrMin = numberOption("snr-min", o.snrMin, (v) => v > 0, "must be a positive S/N");
  const dustBeta = numberOption("dust-beta", o.dustBeta, (v) => v > -5 && v < 5, "must be a spectral index between -5 and 5");
  const dustTemp = numberOption("dust-temp", o.dustTemp, (v) => v > 0, "must be a positive temperature in K");
  const apodisation = numberOption("apodisation", o.apodisation, (v) => v >= 0, "must be ≥ 0 arcmin");
  const iterations = numberOption("iterations", o.iterations, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0");
  const sizes = o.sizes === undefined ? undefined : sizesOption("sizes", o.sizes);
  progress(`umbra search: reading ${o.bands}`);
  const stack = await loadBandStack(o.bands);
  for (const w of stack.warnings) process.stderr.write(`umbra: warning: ${w}\n`);
  const { seds: deproject, names } = deprojectSeds(stack, o.deproject, dustBeta, dustTemp);
  const snrMaps: { theta: number; map: Float32Array }[] = [];
  const result = searchClusters(stack, {
    profile: a10ProfileShape(),
    tszSed: stackSedProvider(stack).tsz(0),
    snrMin,
    deproject,
    maxIterations: iterations,
    apodisationArcmin: apodisation,
    ...(sizes === undefined ? {} : { sizesArcmin: sizes }),
    ...(o.snrMaps === undefined ? {} : { onSnrMap: (theta: number, m: Float64Array) => snrMaps.push({ theta, map: Float32Array.from(m) }) }),
  });
  await writeCsvAtomic(o.out, SEARCH_COLUMNS, result.candidates.map(row));
  const settings = {
    profile: "gnfw-a10 (Arnaud et al. 2010), truncated at 5 R500", snrMin, thresholdUses: "raw S/N (maximised over position and size)",
    debiasing: "sqrt(max(snr^2 - 3, 0)) (Vanderlinde et al. 2010)", sizesArcmin: sizes ?? "default (15 sizes, 0.5–10 arcmin)",
    deproject: names, dust: { beta: dustBeta, temperatureK: dustTemp, refFrequencyGHz: 353 }, apodisationArcmin: apodisation, cleaningIterations: iterations,
  };
  if (o.snrMaps !== undefined) {
    await mkdir(o.snrMaps, { recursive: true });
    for (const s of snrMaps) {
      const name = `snr_theta${s.theta.toFixed(3)}arcmin.fits`;
      await writeSkyMapFits(join(o.snrMaps, name), { data: Float64Array.from(s.map), nx: stack.nx, ny: stack.ny, wcs: stack.wcs }, {
        bitpix: -32,
        extname: "SNR",
        cards: [{ keyword: "THETA500", value: s.theta, comment: "filter size theta500 [arcmin]" }],
        provenance: { tool: "umbra", version: VERSION, settings: { command: "search", ...settings }, inputs: stack.inputs.map((i) => ({ file: i.path, sha256: i.sha256 })) },
      });
    }
  }
  if (o.json === true) {
    const doc = {
      provenance: { tool: "umbra", version: VERSION, command: "search", inputs: stack.inputs, settings },
      warnings: stack.warnings,
      diagnostics: result.diagnostics,
      candidates: result.candidates,
    };
    await writeTextAtomic(jsonPathFor(o.out), `${JSON.stringify(doc, jsonSafe, 2)}\n`);
  }
  progress(`umbra search: ${result.candidates.length} candidates with raw S/N ≥ ${snrMin} written to ${o.out}`);
}

/** Register `umbra search`. */
export function register(program: Command): void {
  program
    .command("search")
    .description("Blind cluster search with the multi-frequency matched filter over a grid of sizes.")
    .requiredOption("--bands <manifest.json>", "band manifest (JSON; paths inside are relative to it)")
    .requiredOption("--out <candidates.csv>", "output CSV of candidates (written atomically)")
    .option("--snr-min <snr>", "threshold on the raw S/N (maximised over position and size)", "4.5")
    .option("--sizes <list>", "filter sizes theta500 in arcmin, comma-separated (default: 15 sizes log-spaced 0.5–10)")
    .option("--snr-maps <dir>", "write each size's S/N map as FITS into this folder")
    .option("--deproject <list>", "components to null in the filter, comma-separated: cmb, dust (default: none)")
    .option("--dust-beta <beta>", "dust SED spectral index for --deproject dust", "1.6")
    .option("--dust-temp <K>", "dust SED temperature in K for --deproject dust", "20")
    .option("--apodisation <arcmin>", "width of the edge taper in arcmin", "8")
    .option("--iterations <n>", "cleaning iterations: detections subtracted, covariance re-estimated", "2")
    .option("--json", "also write <out>.json with diagnostics and provenance")
    .action(async (o: SearchCliOptions) => runSearch(o));
}
