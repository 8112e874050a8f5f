/**
 * `umbra ymap`: a Compton-y map from a band manifest by the ILC family (@umbra/estimators
 * buildYMap): standard, constrained (deprojecting the CMB and/or a dust SED) or scale-dependent.
 * Writes the y map as FITS (WCS of the first band, effective beam and provenance in the header),
 * its noise power spectrum as CSV beside it (`<out>.noise.csv`; with `--catalog`, measured with the
 * catalogued clusters cut out), and the ILC report (weights per
 * band and ell window, bias fraction per window, condition numbers) as JSON (`<out>.ilc.json`);
 * `--json` also prints that report on stdout.
 */
import { basename } from "node:path";
import type { Command } from "commander";
import { UmbraError } from "@umbra/core";
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { buildYMap, ilcBandsFromStack, loadBandStack, parseEllWindows, yMapNoisePower, DEPROJECT_KINDS, type DeprojectKind, type IlcKind, type YMapOptions } from "@umbra/estimators";
import { readClusterCatalog, worldToPixel, writeCsvAtomic, writeFits, writeTextAtomic, type Provenance } from "@umbra/maps";
import { VERSION } from "../version.js";

interface YMapCliOptions {
  bands: string;
  out: string;
  ilc: string;
  deproject?: string;
  dustBeta: string;
  dustTemp: string;
  ellWindows?: string;
  transition: string;
  maxBias: string;
  effectiveFwhm?: string;
  teKev?: string;
  apodisation?: string;
  catalog?: string;
  holeArcmin: string;
  json?: boolean;
}

function num(name: string, text: string, ok: (v: number) => boolean, why: string): number {
  const v = Number(text);
  if (text.trim() === "" || !Number.isFinite(v) || !ok(v)) throw new UmbraError("BAD_OPTION", `--${name} ${text}: ${why}`, { field: name, value: text });
  return v;
}

/** Parse and check the command's options into buildYMap options (exported for tests). */
export function yMapOptionsFrom(o: Omit<YMapCliOptions, "bands" | "out" | "json" | "catalog" | "holeArcmin">): YMapOptions {
  const kinds: readonly string[] = ["standard", "constrained", "scale"];
  if (!kinds.includes(o.ilc)) throw new UmbraError("BAD_OPTION", `--ilc ${o.ilc}: use standard, constrained or scale`, { field: "ilc", value: o.ilc });
  const ilc = o.ilc as IlcKind;
  let deproject: DeprojectKind[] | undefined;
  if (o.deproject !== undefined) {
    deproject = o.deproject.split(",").map((s) => s.trim().toLowerCase()).filter((s) => s.length > 0) as DeprojectKind[];
    for (const d of deproject) {
      if (!DEPROJECT_KINDS.includes(d)) throw new UmbraError("BAD_OPTION", `--deproject: unknown component '${d}' (use cmb, dust)`, { field: "deproject", value: d });
    }
  }
  if (ilc === "standard" && deproject !== undefined && deproject.length > 0) {
    throw new UmbraError("BAD_OPTION", "--deproject needs --ilc constrained or scale (the standard ILC has the tSZ constraint only)", { field: "deproject" });
  }
  const transition = num("transition", o.transition, (v) => v > 0 && v <= 2, "must be in (0, 2]");
  if (o.ellWindows !== undefined && ilc !== "scale") throw new UmbraError("BAD_OPTION", "--ell-windows needs --ilc scale", { field: "ell-windows" });
  const out: YMapOptions = {
    ilc,
    transitionFraction: transition,
    maxBiasFraction: num("max-bias", o.maxBias, (v) => v > 0 && v < 1, "must be a fraction in (0, 1)"),
    dust: { beta: num("dust-beta", o.dustBeta, (v) => v >= 0 && v <= 4, "must be in [0, 4]"), temperatureK: num("dust-temp", o.dustTemp, (v) => v > 2 && v <= 100, "must be in (2, 100] K"), refFrequencyGHz: 353 },
  };
  if (deproject !== undefined) out.deproject = deproject;
  if (o.ellWindows !== undefined) out.ellBoundaries = parseEllWindows(o.ellWindows, transition).boundariesEll;
  if (o.effectiveFwhm !== undefined) out.effectiveFwhmArcmin = num("effective-fwhm", o.effectiveFwhm, (v) => v > 0, "must be a positive number of arcmin");
  if (o.teKev !== undefined) out.kTeKeV = num("te-kev", o.teKev, (v) => v > 0 && v <= 100, "must be in (0, 100] keV");
  if (o.apodisation !== undefined) out.apodisationWidthPix = num("apodisation", o.apodisation, (v) => v >= 0, "must be ≥ 0 pixels");
  return out;
}

function stripFits(path: string): string {
  return path.replace(/\.fits?(\.gz)?$/i, "");
}

async function yMapAction(o: YMapCliOptions): Promise<void> {
  const options = yMapOptionsFrom(o);
  const stack = await loadBandStack(o.bands);
  for (const w of stack.warnings) process.stderr.write(`umbra: warning: ${w}\n`);
  const product = buildYMap(ilcBandsFromStack(stack), stack.geometry, options);
  // with a catalogue, the noise power is measured with every catalogued cluster cut out
  let noisePower = product.noisePower;
  let noiseNote = "power of the y map itself (clusters included)";
  if (o.catalog !== undefined) {
    const hole = num("hole-arcmin", o.holeArcmin, (v) => v > 0, "must be a positive number of arcmin");
    const catalog = await readClusterCatalog(o.catalog);
    for (const p of catalog.problems) process.stderr.write(`umbra: warning: ${o.catalog}, row ${p.row}, column '${p.column}': ${p.message} (row skipped)\n`);
    const positions = catalog.rows.flatMap((r) => {
      if (stack.wcs === null) return [];
      const p = worldToPixel(stack.wcs, r.raDeg, r.decDeg);
      const radiusArcmin = r.theta500Arcmin !== null ? Math.max(hole, 3 * r.theta500Arcmin) : hole;
      return Number.isFinite(p.ix) && Number.isFinite(p.iy) ? [{ xPix: p.ix, yPix: p.iy, radiusArcmin }] : [];
    });
    noisePower = yMapNoisePower(product, { positions, holeRadiusArcmin: hole });
    noiseNote = `power of the y map with ${positions.length} catalogued clusters cut out (radius max(hole, 3 theta500))`;
  }
  const settings: Record<string, unknown> = { command: "ymap", ...options, catalog: o.catalog === undefined ? null : basename(o.catalog), holeArcmin: o.catalog === undefined ? null : Number(o.holeArcmin) };
  const inputs = stack.inputs.map((i) => ({ file: basename(i.path), sha256: i.sha256 }));
  if (o.catalog !== undefined) inputs.push({ file: basename(o.catalog), sha256: createHash("sha256").update(await readFile(o.catalog)).digest("hex") });
  const provenance: Provenance = { tool: "umbra", version: VERSION, settings, inputs };
  await writeFits(
    o.out,
    [
      {
        data: product.y,
        nx: stack.nx,
        ny: stack.ny,
        wcs: stack.wcs,
        bunit: "Compton-y",
        cards: [
          { keyword: "YMAPKIND", value: product.ilc, comment: "ILC family member" },
          { keyword: "DEPROJ", value: product.deprojected.join(",") || "none", comment: "components with zero response" },
          { keyword: "BEAMFWHM", value: product.effectiveFwhmArcmin, comment: "[arcmin] Gaussian FWHM of the y map's beam" },
          { keyword: "ILCNWIN", value: product.domains.length, comment: "number of ell windows after merging" },
          { keyword: "ILCBIASM", value: Math.max(...product.domains.map((d) => d.biasFraction)), comment: "largest ILC bias fraction (m-k)/N_p" },
        ],
      },
    ],
    { provenance },
  );
  const base = stripFits(o.out);
  const rows = Array.from(noisePower.cl, (cl, i) => ({ ell: noisePower.ellCenters[i] as number, cl_sr: cl, modes: noisePower.modeCounts[i] as number }));
  await writeCsvAtomic(`${base}.noise.csv`, ["ell", "cl_sr", "modes"], rows);
  const report = {
    ymap: basename(o.out),
    ilc: product.ilc,
    deprojected: product.deprojected,
    effective_fwhm_arcmin: product.effectiveFwhmArcmin,
    bands: product.bands,
    constraints: product.constraints,
    max_bias_fraction: product.maxBiasFraction,
    bias_within_limit: product.biasWithinLimit,
    merges: product.merges,
    windows: product.domains.map((d) => ({
      ell_min: d.ellMin,
      ell_max: Number.isFinite(d.ellMax) ? d.ellMax : null,
      independent_modes: d.independentModes,
      bias_fraction: d.biasFraction,
      condition_number: d.conditionNumber,
      correlation_condition_number: d.correlationConditionNumber,
      weights: Object.fromEntries(product.bands.map((b, i) => [b, d.weights[i]])),
    })),
    noise_power: basename(`${base}.noise.csv`),
    noise_power_note: noiseNote,
    apodisation: product.apodisation,
    provenance,
  };
  const text = `${JSON.stringify(report, null, 2)}\n`;
  await writeTextAtomic(`${base}.ilc.json`, text);
  if (!product.biasWithinLimit) {
    process.stderr.write(`umbra: warning: an ell window's ILC bias fraction exceeds ${product.maxBiasFraction} even after merging (see ${basename(base)}.ilc.json)\n`);
  }
  if (o.json === true) process.stdout.write(text);
}

/** Register `umbra ymap`. */
export function register(program: Command): void {
  program
    .command("ymap")
    .description("Build a Compton-y map from a band manifest with the ILC family; write it as FITS with its noise power (CSV) and ILC report (JSON).")
    .requiredOption("--bands <manifest.json>", "band manifest (JSON; paths inside are relative to it)")
    .requiredOption("--out <Y.fits>", "output y map (FITS); <out>.noise.csv and <out>.ilc.json are written beside it")
    .option("--ilc <kind>", "standard (one domain, tSZ constraint), constrained (one domain, + zero response to --deproject) or scale (smooth ell windows)", "scale")
    .option("--deproject <list>", "components to null, comma-separated: cmb, dust (default: cmb for --ilc constrained, none otherwise)")
    .option("--dust-beta <beta>", "dust emissivity index of the deprojected modified blackbody", "1.6")
    .option("--dust-temp <K>", "dust temperature in K of the deprojected modified blackbody (reference 353 GHz)", "19.6")
    .option("--ell-windows <l1,l2,...>", "boundaries of the ell windows for --ilc scale (multipoles; default 300, 600, 1200, … below the Nyquist multipole)")
    .option("--transition <fraction>", "width of each window's cos² transition as a fraction of its boundary", "0.5")
    .option("--max-bias <fraction>", "largest ILC bias fraction (m − k)/N_p per window; windows are merged until it holds", "0.01")
    .option("--effective-fwhm <arcmin>", "FWHM in arcmin of the y map's Gaussian beam (default: the widest band's)")
    .option("--te-kev <keV>", "electron temperature for a relativistic tSZ response (default: non-relativistic)")
    .option("--apodisation <pixels>", "width in pixels of the edge taper used for the covariance (default: 5 % of the smaller side)")
    .option("--catalog <clusters.csv>", "cluster catalogue (CSV: id,ra_deg,dec_deg[,theta500_arcmin]); the noise power is then measured with these clusters cut out")
    .option("--hole-arcmin <arcmin>", "radius cut out around each catalogued cluster for the noise power (at least 3 theta500 when given)", "5")
    .option("--json", "also print the ILC report (JSON) on stdout")
    .action(yMapAction);
}
