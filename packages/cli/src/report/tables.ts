/**
 * Reading umbra's own CSV outputs back for reports (truth catalogues, measure and search results),
 * through the catalogue reader of `@umbra/maps` (id, ra_deg, dec_deg required; other columns kept).
 */
import { readClusterCatalog, type ClusterRow } from "@umbra/maps";
import type { RealisationRecord } from "@umbra/simulate";
import { FATAL_FLAGS } from "@umbra/estimators";

/** A numeric extra column of a row (NaN when absent or `nan`); the reader keys columns in lower case. */
export function num(row: ClusterRow, column: string): number {
  const v = row.extra[column.toLowerCase()];
  if (v === undefined || v === "" || v.toLowerCase() === "nan") return Number.NaN;
  return Number(v);
}

/** Rows of an umbra CSV output; problems (bad rows) are returned, not thrown. */
export async function readRows(path: string): Promise<ClusterRow[]> {
  return (await readClusterCatalog(path)).rows;
}

/** True when the `flags` column holds a flag that makes the measurement unusable (estimators' FATAL_FLAGS). */
export function hasFatalFlag(flags: string | undefined): boolean {
  return (flags ?? "").split("|").some((f) => (FATAL_FLAGS as readonly string[]).includes(f));
}

/**
 * One realisation's record for `regressionSummary` from the truth CSV (simulate), the forced
 * photometry CSV (measure) and the candidate CSV (search). True S/N = true Y5R500 ÷ the forced
 * measurement's error; truth clusters near the edge or with unusable measurements are left out.
 */
export function realisationRecord(seed: number, truth: readonly ClusterRow[], forced: readonly ClusterRow[], candidates: readonly ClusterRow[]): RealisationRecord {
  const byId = new Map(forced.map((r) => [r.id, r]));
  const rec: RealisationRecord = { seed, truth: [], forced: [], detections: [] };
  for (const t of truth) {
    if (num(t, "in_field") === 0 || num(t, "near_edge") === 1) continue;
    const m = byId.get(t.id);
    if (m === undefined) continue;
    const err = num(m, "Y5R500_err_arcmin2");
    const y = num(m, "Y5R500_arcmin2");
    if (!(err > 0) || !Number.isFinite(y) || hasFatalFlag(m.extra["flags"])) continue;
    const yTrue = num(t, "y5r500_arcmin2");
    rec.truth.push({ id: t.id, raDeg: t.raDeg, decDeg: t.decDeg, yArcmin2: yTrue, snrTrue: yTrue / err });
    rec.forced.push({ id: t.id, yArcmin2: y, yErrArcmin2: err });
  }
  for (const c of candidates) rec.detections.push({ raDeg: c.raDeg, decDeg: c.decDeg, snr: num(c, "snr") });
  return rec;
}
