/**
 * The provenance block every umbra output carries: which tool and version made it, with which
 * settings, from which inputs (each named and fingerprinted by SHA-256). Written into FITS headers by
 * the FITS writer and into JSON/CSV outputs by their writers.
 */
import { basename } from "node:path";
import { sha256File } from "./hash.js";

/** One input file: its name as given (relative paths preferred) and the SHA-256 of its bytes. */
export interface ProvenanceInput {
  file: string;
  sha256: string;
}

/** Who made an output, how, and from what. */
export interface Provenance {
  /** Tool name, e.g. "umbra". */
  tool: string;
  /** Tool version, e.g. "0.1.0". */
  version: string;
  /** Every setting that influenced the output (JSON-serialisable). */
  settings: Record<string, unknown>;
  inputs: ProvenanceInput[];
  /** UTC creation time (ISO 8601); omit it to keep outputs byte-identical across runs. */
  createdUtc?: string;
}

/**
 * Build a provenance block, hashing each input file. Input names are stored as given unless
 * `baseNamesOnly` is set, in which case only the file's base name is kept (no machine paths).
 */
export async function makeProvenance(
  tool: string,
  version: string,
  settings: Record<string, unknown>,
  inputPaths: readonly string[],
  options: { baseNamesOnly?: boolean; createdUtc?: string } = {},
): Promise<Provenance> {
  const inputs: ProvenanceInput[] = [];
  for (const p of inputPaths) inputs.push({ file: options.baseNamesOnly === true ? basename(p) : p, sha256: await sha256File(p) });
  const prov: Provenance = { tool, version, settings, inputs };
  if (options.createdUtc !== undefined) prov.createdUtc = options.createdUtc;
  return prov;
}

/**
 * JSON text of `value` with object keys sorted at every level, so the same settings always give the
 * same bytes (used for settings in provenance) — common practice, no source.
 */
export function stableJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(sortKeys);
  if (v !== null && typeof v === "object") {
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(v as Record<string, unknown>).sort()) out[k] = sortKeys((v as Record<string, unknown>)[k]);
    return out;
  }
  return v;
}
