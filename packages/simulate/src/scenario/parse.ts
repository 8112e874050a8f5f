/**
 * Validate a scenario: every problem found in one pass, reported together as one BAD_SCENARIO
 * error naming the file and each offending field.
 */
import { UmbraError } from "@umbra/core";
import { COSMOLOGY_PRESETS, COSMOLOGY_PRESET_NAMES } from "@umbra/clusters";
import { scenarioSchema, type Scenario } from "./schema.js";

function pathOf(path: readonly PropertyKey[]): string {
  let s = "";
  for (const p of path) s += typeof p === "number" ? `[${p}]` : s === "" ? String(p) : `.${String(p)}`;
  return s === "" ? "(top level)" : s;
}

/**
 * Parse a scenario from already-decoded JSON (`file` names it in errors). Returns the scenario with
 * defaults filled in, or throws BAD_SCENARIO listing every problem (zod schema, plus cross-field
 * checks: unique band names, bandpass lengths, radio flux range).
 */
export function parseScenario(json: unknown, file: string): Scenario {
  const r = scenarioSchema.safeParse(json);
  const problems: string[] = [];
  if (!r.success) {
    for (const issue of r.error.issues) problems.push(`${pathOf(issue.path)}: ${issue.message}`);
  } else {
    const s = r.data;
    const seen = new Set<string>();
    s.bands.forEach((b, i) => {
      if (seen.has(b.name)) problems.push(`bands[${i}].name: duplicate band name '${b.name}'`);
      seen.add(b.name);
      if (b.bandpass && b.bandpass.frequencyGHz.length !== b.bandpass.weight.length) problems.push(`bands[${i}].bandpass: frequencyGHz and weight lengths differ`);
      if (b.unit === "Jy/beam" && b.bandpass === undefined && b.frequencyGHz === undefined) problems.push(`bands[${i}]: no frequency`);
    });
    const radio = s.sky.radio;
    if (radio) {
      if (!(radio.maxFluxJy > radio.minFluxJy)) problems.push("sky.radio.maxFluxJy: must exceed minFluxJy");
      if ((radio.breakFluxJy === undefined) !== (radio.slopeAbove === undefined)) problems.push("sky.radio: give both breakFluxJy and slopeAbove, or neither");
      if (radio.breakFluxJy !== undefined && !(radio.breakFluxJy > radio.minFluxJy && radio.breakFluxJy < radio.maxFluxJy)) problems.push("sky.radio.breakFluxJy: must lie between minFluxJy and maxFluxJy");
    }
    const names = COSMOLOGY_PRESET_NAMES as readonly string[];
    if (!names.includes(s.cosmology)) problems.push(`cosmology: unknown preset '${s.cosmology}' (known: ${names.join(", ")})`);
    const mf = s.sky.clusters?.massFunction;
    if (mf && names.includes(s.cosmology)) {
      const p = COSMOLOGY_PRESETS[s.cosmology as keyof typeof COSMOLOGY_PRESETS];
      if (p.sigma8 === undefined || p.ns === undefined || p.omegaB0 === undefined) problems.push(`cosmology: preset '${s.cosmology}' has no sigma8, ns or omegaB0, which a mass-function draw needs`);
    }
    if (mf && !(mf.mMaxMsun > mf.mMinMsun)) problems.push("sky.clusters.massFunction.mMaxMsun: must exceed mMinMsun");
    if (mf && !(mf.zMax > mf.zMin)) problems.push("sky.clusters.massFunction.zMax: must exceed zMin");
    const ids = new Set<string>();
    s.sky.clusters?.list?.forEach((c, i) => {
      if (ids.has(c.id)) problems.push(`sky.clusters.list[${i}].id: duplicate id '${c.id}'`);
      ids.add(c.id);
    });
    if (problems.length === 0) return s;
  }
  throw new UmbraError("BAD_SCENARIO", `scenario has ${problems.length} problem(s): ${problems[0]}`, { file }, problems);
}
