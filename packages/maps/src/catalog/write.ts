/**
 * Writing CSV tables atomically (csv-stringify + temp file and rename). Numbers are written with
 * JavaScript's shortest round-trip representation (`String(x)`, ECMA-262 Number::toString), so
 * reading them back gives the identical double; NaN is written `nan`, infinities `inf` / `-inf`,
 * null and undefined as an empty field.
 */
import { stringify } from "csv-stringify/sync";
import { writeTextAtomic } from "../manifest/atomic.js";
import type { ClusterRow } from "./read.js";

/** A value a CSV cell can hold. */
export type CsvValue = string | number | boolean | null | undefined;

/** Format one cell: shortest round-trip numbers, `nan`, `inf`, `-inf`, empty for null. */
export function formatCsvNumber(x: number): string {
  if (Number.isNaN(x)) return "nan";
  if (x === Infinity) return "inf";
  if (x === -Infinity) return "-inf";
  return String(x);
}

/** Render `rows` (objects keyed by column name) under a header of `columns` as CSV text. */
export function toCsv(columns: readonly string[], rows: ReadonlyArray<Readonly<Record<string, CsvValue>>>): string {
  const table = rows.map((row) =>
    columns.map((c) => {
      const v = row[c];
      if (v === null || v === undefined) return "";
      if (typeof v === "number") return formatCsvNumber(v);
      return String(v);
    }),
  );
  return stringify([Array.from(columns), ...table], { record_delimiter: "unix" });
}

/** Write a CSV table atomically (temp file + rename): header `columns`, one line per row. */
export async function writeCsvAtomic(path: string, columns: readonly string[], rows: ReadonlyArray<Readonly<Record<string, CsvValue>>>): Promise<void> {
  await writeTextAtomic(path, toCsv(columns, rows));
}

/** Write cluster rows in the catalogue format read by `readClusterCatalog` (extra columns after the standard ones). */
export async function writeClusterCatalog(path: string, rows: readonly ClusterRow[], extraColumns: readonly string[] = []): Promise<void> {
  const columns = ["id", "ra_deg", "dec_deg", "theta500_arcmin", "z", "m500_msun", "te_kev", ...extraColumns];
  const table = rows.map((r) => ({
    id: r.id,
    ra_deg: r.raDeg,
    dec_deg: r.decDeg,
    theta500_arcmin: r.theta500Arcmin,
    z: r.z,
    m500_msun: r.m500Msun,
    te_kev: r.teKeV,
    ...Object.fromEntries(extraColumns.map((c) => [c, r.extra[c] ?? ""])),
  }));
  await writeCsvAtomic(path, columns, table);
}
