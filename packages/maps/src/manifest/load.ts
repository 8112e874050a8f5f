/**
 * Loading and validating a band manifest: every problem is collected (schema, duplicate names,
 * missing files) and reported at once in one BAD_MANIFEST error before any heavy work.
 */
import { access, readFile } from "node:fs/promises";
import { dirname, isAbsolute, resolve } from "node:path";
import { UmbraError } from "@umbra/core";
import type { z } from "zod";
import { BAND_KEYS, PATH_KEYS, TOP_KEYS, bandEntrySchema, manifestFileSchema } from "./schema.js";
import type { BandManifest, BandSpec } from "./schema.js";

/** Result of {@link loadBandManifest}: the manifest and warnings (unknown keys). */
export interface LoadedManifest {
  manifest: BandManifest;
  warnings: string[];
}

/**
 * Read, validate and resolve a band manifest (JSON). Paths inside are relative to the manifest's
 * folder and come back absolute. Unknown keys give warnings; every error (wrong type, missing
 * field, neither frequency_ghz nor bandpass, neither beam_fwhm_arcmin nor beam, duplicate band
 * name, a referenced file that does not exist) is collected into one
 * UmbraError("BAD_MANIFEST") whose `problems` name the band and field of each.
 *
 * @throws UmbraError NOT_FOUND when the manifest itself does not exist; BAD_MANIFEST otherwise.
 */
export async function loadBandManifest(path: string): Promise<LoadedManifest> {
  const file = resolve(path);
  let text: string;
  try {
    text = await readFile(file, "utf8");
  } catch {
    throw new UmbraError("NOT_FOUND", "band manifest not found or unreadable", { file: path });
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new UmbraError("BAD_MANIFEST", `not valid JSON (${(e as Error).message})`, { file: path }, [`not valid JSON: ${(e as Error).message}`]);
  }
  return validateManifest(raw, file, path);
}

/**
 * Validate an already-parsed manifest object (as {@link loadBandManifest}); `file` is the absolute
 * manifest path that relative paths resolve against, `label` the name used in messages.
 */
export async function validateManifest(raw: unknown, file: string, label: string = file): Promise<LoadedManifest> {
  const problems: string[] = [];
  const warnings: string[] = [];
  const top = manifestFileSchema.safeParse(raw);
  if (!top.success) {
    for (const issue of top.error.issues) problems.push(`${issue.path.length > 0 ? `field '${issue.path.join(".")}'` : "top level"}: ${issue.message}`);
    throw new UmbraError("BAD_MANIFEST", summary(problems), { file: label }, problems);
  }
  for (const key of Object.keys(top.data)) {
    if (!(TOP_KEYS as readonly string[]).includes(key)) warnings.push(`unknown top-level key '${key}' ignored`);
  }
  const dir = dirname(file);
  const bands: BandSpec[] = [];
  const seen = new Map<string, number>();
  const fileChecks: Array<Promise<void>> = [];
  top.data.bands.forEach((entry, i) => {
    const obj = typeof entry === "object" && entry !== null && !Array.isArray(entry) ? (entry as Record<string, unknown>) : null;
    const rawName = obj !== null && typeof obj.name === "string" && obj.name.trim() !== "" ? obj.name.trim() : null;
    const who = rawName === null ? `bands[${i}]` : `band '${rawName}' (bands[${i}])`;
    if (rawName !== null) {
      const first = seen.get(rawName);
      if (first !== undefined) problems.push(`${who}: field 'name': duplicate of bands[${first}]`);
      else seen.set(rawName, i);
    }
    // file existence is checked for every path-like string, even when other fields are invalid
    const resolved: Record<string, string> = {};
    if (obj !== null) {
      for (const field of PATH_KEYS) {
        const p = obj[field];
        if (typeof p !== "string" || p.trim() === "") continue;
        const full = isAbsolute(p.trim()) ? p.trim() : resolve(dir, p.trim());
        resolved[field] = full;
        fileChecks.push(
          access(full).catch(() => {
            problems.push(`${who}: field '${field}': file not found: ${p}`);
          }),
        );
      }
    }
    const parsed = bandEntrySchema.safeParse(entry);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) problems.push(describeIssue(who, issue));
      return;
    }
    const b = parsed.data;
    for (const key of Object.keys(b)) {
      if (!(BAND_KEYS as readonly string[]).includes(key)) warnings.push(`${who}: unknown key '${key}' ignored`);
    }
    if (b.frequency_ghz === undefined && b.bandpass === undefined) problems.push(`${who}: field 'frequency_ghz': give frequency_ghz or bandpass`);
    if (b.beam_fwhm_arcmin === undefined && b.beam === undefined) problems.push(`${who}: field 'beam_fwhm_arcmin': give beam_fwhm_arcmin or beam`);
    const abs = (field: (typeof PATH_KEYS)[number]): string | null => resolved[field] ?? null;
    bands.push({
      name: b.name,
      mapPath: abs("map") as string,
      frequencyGHz: b.frequency_ghz ?? null,
      bandpassPath: abs("bandpass"),
      beamFwhmArcmin: b.beam_fwhm_arcmin ?? null,
      beamPath: abs("beam"),
      unit: b.unit,
      ivarPath: abs("ivar"),
      maskPath: abs("mask"),
      hdu: b.hdu ?? null,
    });
  });
  await Promise.all(fileChecks);
  if (problems.length > 0) throw new UmbraError("BAD_MANIFEST", summary(problems), { file: label }, problems);
  return { manifest: { path: file, name: top.data.name ?? null, bands }, warnings };
}

function describeIssue(who: string, issue: z.core.$ZodIssue): string {
  const field = issue.path.length > 0 ? issue.path.join(".") : "(entry)";
  const missing = issue.code === "invalid_type" && /received undefined/.test(issue.message);
  return `${who}: field '${field}': ${missing ? "required field is missing" : issue.message}`;
}

function summary(problems: string[]): string {
  return `${problems.length} problem${problems.length === 1 ? "" : "s"} in the band manifest: ${problems.join("; ")}`;
}
