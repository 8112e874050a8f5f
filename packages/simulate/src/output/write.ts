/**
 * Writing a simulated field to a folder: one FITS image per band (and its inverse variance) with
 * WCS, bandpass tables for bandpass bands, the band manifest, the truth catalogues and the
 * provenance (validated scenario, seed, SHA-256 of every file). Every file is written atomically
 * and nothing depends on the clock, so the same scenario and seed reproduce the bytes.
 */
import { createHash } from "node:crypto";
import { mkdir, readFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { formatCsvNumber, writeBandManifest, writeClusterCatalog, writeCsvAtomic, writeTextAtomic, type BandManifest } from "@umbra/maps";
import type { SimulatedField } from "../sky/simulate.js";
import { writeBandFits } from "./fits.js";
import { CLUSTER_TRUTH_EXTRA_COLUMNS, RADIO_TRUTH_COLUMNS, clusterTruthRows, radioTruthRows } from "./truth.js";

/** Name of the tool written into provenance and FITS headers. */
export const SIMULATOR_NAME = "umbra simulate";

/** What {@link writeSimulatedField} wrote. */
export interface WrittenField {
  manifestPath: string;
  truthPath: string;
  radioPath: string;
  provenancePath: string;
  /** Every file written, in order (absolute paths). */
  files: string[];
}

async function sha256(path: string): Promise<string> {
  return createHash("sha256").update(await readFile(path)).digest("hex");
}

/** Options of {@link writeSimulatedField}. */
export interface WriteFieldOptions {
  /** Version of the calling tool for the provenance blocks (the CLI passes its own). */
  toolVersion?: string;
}

/** Write `field` into `outDir` (created if needed); see the module comment for the files. */
export async function writeSimulatedField(field: SimulatedField, outDir: string, options: WriteFieldOptions = {}): Promise<WrittenField> {
  const dir = resolve(outDir);
  await mkdir(dir, { recursive: true });
  const version = options.toolVersion ?? "library";
  const fitsProvenance = { tool: SIMULATOR_NAME, version, settings: { scenario: field.scenario.name, seed: field.seed }, inputs: [] };
  const files: string[] = [];
  const manifest: BandManifest = { path: join(dir, "bands.json"), name: field.scenario.name, bands: [] };
  for (const b of field.bands) {
    const mapPath = join(dir, `${b.name}.fits`);
    await writeBandFits(mapPath, field, b, "map", fitsProvenance);
    files.push(mapPath);
    let ivarPath: string | null = null;
    if (b.ivar) {
      ivarPath = join(dir, `${b.name}_ivar.fits`);
      await writeBandFits(ivarPath, field, b, "ivar", fitsProvenance);
      files.push(ivarPath);
    }
    let bandpassPath: string | null = null;
    if ("bandpass" in b.band) {
      bandpassPath = join(dir, `${b.name}_bandpass.txt`);
      const bp = b.band.bandpass;
      const lines = ["# frequency_ghz weight"];
      for (let i = 0; i < bp.frequencyGHz.length; i++) lines.push(`${formatCsvNumber(bp.frequencyGHz[i]!)} ${formatCsvNumber(bp.weight[i]!)}`);
      await writeTextAtomic(bandpassPath, `${lines.join("\n")}\n`);
      files.push(bandpassPath);
    }
    manifest.bands.push({
      name: b.name,
      mapPath,
      frequencyGHz: b.frequencyGHz,
      bandpassPath,
      beamFwhmArcmin: b.beamFwhmArcmin,
      beamPath: null,
      unit: b.unit,
      ivarPath,
      maskPath: null,
      hdu: null,
    });
  }
  await writeBandManifest(manifest.path, manifest);
  files.push(manifest.path);
  const truthPath = join(dir, "truth_clusters.csv");
  await writeClusterCatalog(truthPath, clusterTruthRows(field.clusters), CLUSTER_TRUTH_EXTRA_COLUMNS);
  files.push(truthPath);
  const radioPath = join(dir, "truth_radio.csv");
  await writeCsvAtomic(radioPath, RADIO_TRUTH_COLUMNS, radioTruthRows(field.radioSources));
  files.push(radioPath);
  const hashes: Record<string, string> = {};
  for (const f of files) hashes[f.slice(dir.length + 1)] = await sha256(f);
  const provenance = {
    tool: SIMULATOR_NAME,
    version,
    seed: field.seed,
    scenario: field.scenario,
    expectedClusterCount: field.expectedClusterCount,
    clusters: field.clusters.length,
    radioSources: field.radioSources.length,
    files: hashes,
  };
  const provenancePath = join(dir, "provenance.json");
  await writeTextAtomic(provenancePath, `${JSON.stringify(provenance, null, 2)}\n`);
  files.push(provenancePath);
  return { manifestPath: manifest.path, truthPath, radioPath, provenancePath, files };
}
