/**
 * `umbra simulate --scenario S.json --seed N --out DIR`: simulate one multi-band field and write
 * FITS maps with WCS, the band manifest that `measure` reads, the truth catalogues and the
 * provenance (scenario + seed). The same scenario and seed give the same bytes.
 */
import type { Command } from "commander";
import { UmbraError } from "@umbra/core";
import { loadScenario, simulateField, writeSimulatedField } from "@umbra/simulate";
import { VERSION } from "../version.js";

interface SimulateCliOptions {
  scenario: string;
  seed: string;
  out: string;
  json?: boolean;
}

function parseSeed(text: string): number {
  const v = Number(text);
  if (text.trim() === "" || !Number.isInteger(v) || v < 0 || v > 4294967295) {
    throw new UmbraError("BAD_OPTION", `--seed '${text}' must be an integer in [0, 2^32)`, { field: "seed", value: text });
  }
  return v;
}

/** Run the command (exported for tests); returns the written files. */
export async function simulateAction(o: SimulateCliOptions): Promise<string[]> {
  const seed = parseSeed(o.seed);
  const loaded = await loadScenario(o.scenario);
  const field = simulateField(loaded.scenario, seed, loaded.cmbTable ? { cmbTable: loaded.cmbTable } : {});
  const written = await writeSimulatedField(field, o.out, { toolVersion: VERSION });
  const inField = field.clusters.filter((c) => c.inField).length;
  const summary = {
    scenario: loaded.scenario.name,
    seed,
    pixels: [field.geometry.nx, field.geometry.ny],
    bands: field.bands.map((b) => b.name),
    clusters: field.clusters.length,
    clustersInField: inField,
    expectedClusters: field.expectedClusterCount,
    radioSources: field.radioSources.length,
    relativisticTsz: field.scenario.sky.clusters?.relativistic === true,
    manifest: written.manifestPath,
    files: written.files,
  };
  if (o.json === true) process.stdout.write(`${JSON.stringify(summary, null, 2)}\n`);
  else {
    const exp = field.expectedClusterCount === null ? "" : ` (mass-function expectation ${field.expectedClusterCount.toFixed(1)})`;
    process.stdout.write(
      `simulated '${summary.scenario}' seed ${seed}: ${summary.pixels[0]}x${summary.pixels[1]} pixels, bands ${summary.bands.join(", ")}\n` +
        `clusters: ${summary.clusters}${exp}, ${inField} in the field; radio sources: ${summary.radioSources}\n` +
        `manifest: ${written.manifestPath}\n`,
    );
  }
  if (field.clusters.length > 0 && !summary.relativisticTsz) {
    // the truth catalogue carries te_kev (and z, m500_msun, from which measure derives kTe): measuring
    // this non-relativistic sky with it would apply the relativistic spectrum
    process.stderr.write("umbra: note: tSZ painted non-relativistic (scenario sky.clusters.relativistic is false); measure this field with --no-relativistic\n");
  }
  return written.files;
}

/** Register `umbra simulate`. */
export function register(program: Command): void {
  program
    .command("simulate")
    .description("simulate a multi-band sky (CMB, clusters, dust/CIB, radio, noise) from a scenario file and write maps, manifest and truth")
    .requiredOption("--scenario <file>", "scenario JSON file (see docs/simulation.md)")
    .option("--seed <n>", "random seed (integer); the same seed gives the same bytes", "1")
    .requiredOption("--out <dir>", "output folder (created if needed)")
    .option("--json", "print a JSON summary")
    .action(async (o: SimulateCliOptions) => {
      await simulateAction(o);
    });
}
