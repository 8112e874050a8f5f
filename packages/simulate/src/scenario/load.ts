/**
 * Reading a scenario file: JSON text → validated scenario, plus the C_ℓ table it names (a path
 * relative to the scenario file). Missing files are NOT_FOUND; bad JSON or content BAD_SCENARIO.
 */
import { readFile } from "node:fs/promises";
import { dirname, resolve } from "node:path";
import { UmbraError } from "@umbra/core";
import { parseClTable, type ClTable } from "../cmb/clTable.js";
import { parseScenario } from "./parse.js";
import type { Scenario } from "./schema.js";

/** A scenario read from disk: the validated scenario, its C_ℓ table if any, and the file's path. */
export interface LoadedScenario {
  scenario: Scenario;
  cmbTable?: ClTable;
  file: string;
}

async function readText(path: string, what: string): Promise<string> {
  try {
    return await readFile(path, "utf8");
  } catch {
    throw new UmbraError("NOT_FOUND", `cannot read ${what}`, { file: path });
  }
}

/** Read and validate the scenario at `path` (and its C_ℓ table). */
export async function loadScenario(path: string): Promise<LoadedScenario> {
  const text = await readText(path, "scenario file");
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new UmbraError("BAD_SCENARIO", `not valid JSON (${e instanceof Error ? e.message : String(e)})`, { file: path });
  }
  const scenario = parseScenario(json, path);
  const cmb = scenario.sky.cmb;
  if (cmb && "table" in cmb) {
    const tablePath = resolve(dirname(path), cmb.table);
    const cmbTable = parseClTable(await readText(tablePath, "C_ell table"), cmb.column, tablePath);
    return { scenario, cmbTable, file: path };
  }
  return { scenario, file: path };
}
