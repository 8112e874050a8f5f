/**
 * Reading a cluster catalogue from CSV (csv-parse). A header line is required; `id`, `ra_deg`,
 * `dec_deg` are required columns; `theta500_arcmin`, `z`, `m500_msun`, `te_kev` are optional;
 * any other column is kept as a string. Lines starting with `#` and blank lines are skipped.
 * A bad row becomes a {@link CatalogProblem} and is skipped: one bad row never stops the batch.
 */
import { readFile } from "node:fs/promises";
import { parse } from "csv-parse/sync";
import { UmbraError } from "@umbra/core";

/** One cluster as read from a catalogue. Optional numbers are null when absent (empty or `nan`). */
export interface ClusterRow {
  id: string;
  /** Right ascension in degrees, in [0, 360). */
  raDeg: number;
  /** Declination in degrees, in [−90, 90]. */
  decDeg: number;
  theta500Arcmin: number | null;
  z: number | null;
  m500Msun: number | null;
  teKeV: number | null;
  /** Further columns, as written. */
  extra: Record<string, string>;
}

/** A row that was skipped, and why. */
export interface CatalogProblem {
  /** 1-based data row number (the header is row 0). */
  row: number;
  /** 1-based line number in the file. */
  line: number;
  /** Column at fault. */
  column: string;
  message: string;
}

/** Result of {@link readClusterCatalog}. */
export interface ClusterCatalog {
  rows: ClusterRow[];
  problems: CatalogProblem[];
  /** Names of the extra (non-standard) columns, in file order. */
  extraColumns: string[];
}

const REQUIRED = ["id", "ra_deg", "dec_deg"] as const;
const OPTIONAL = ["theta500_arcmin", "z", "m500_msun", "te_kev"] as const;

type OptionalKey = (typeof OPTIONAL)[number];
const RULES: Record<OptionalKey, { ok: (x: number) => boolean; why: string }> = {
  theta500_arcmin: { ok: (x) => x > 0, why: "must be > 0" },
  z: { ok: (x) => x >= 0, why: "must be ≥ 0" },
  m500_msun: { ok: (x) => x > 0, why: "must be > 0" },
  te_kev: { ok: (x) => x > 0, why: "must be > 0" },
};

/**
 * Read a cluster catalogue CSV file (see the module comment for the columns).
 * @throws UmbraError NOT_FOUND when the file is missing; BAD_CATALOG when it is not CSV, has no
 *   header, lacks a required column or repeats a column name.
 */
export async function readClusterCatalog(path: string): Promise<ClusterCatalog> {
  let text: string;
  try {
    text = await readFile(path, "utf8");
  } catch {
    throw new UmbraError("NOT_FOUND", "catalogue not found or unreadable", { file: path });
  }
  return parseClusterCatalog(text, path);
}

/** Parse catalogue CSV text (as {@link readClusterCatalog}); `file` names the source in errors. */
export function parseClusterCatalog(text: string, file = "<catalogue>"): ClusterCatalog {
  let records: Array<{ record: string[]; info: { lines: number } }>;
  try {
    records = parse(text, {
      bom: true,
      comment: "#",
      comment_no_infix: true,
      skip_empty_lines: true,
      trim: true,
      relax_column_count: true,
      info: true,
    }) as unknown as Array<{ record: string[]; info: { lines: number } }>;
  } catch (e) {
    throw new UmbraError("BAD_CATALOG", `not readable as CSV: ${(e as Error).message}`, { file });
  }
  const head = records[0];
  if (head === undefined) throw new UmbraError("BAD_CATALOG", "empty catalogue: a header line is required", { file });
  const header = head.record.map((h) => h.trim().toLowerCase());
  const index = new Map<string, number>();
  header.forEach((h, i) => {
    if (h === "") throw new UmbraError("BAD_CATALOG", `column ${i + 1} has an empty name`, { file, row: 0 });
    if (index.has(h)) throw new UmbraError("BAD_CATALOG", `column '${h}' appears twice`, { file, row: 0, field: h });
    index.set(h, i);
  });
  for (const c of REQUIRED) {
    if (!index.has(c)) throw new UmbraError("BAD_CATALOG", `required column '${c}' is missing (header: ${header.join(",")})`, { file, row: 0, field: c });
  }
  const known = new Set<string>([...REQUIRED, ...OPTIONAL]);
  const extraColumns = header.filter((h) => !known.has(h));
  const rows: ClusterRow[] = [];
  const problems: CatalogProblem[] = [];
  const seenIds = new Map<string, number>();

  for (let r = 1; r < records.length; r++) {
    const { record, info } = records[r] as { record: string[]; info: { lines: number } };
    const line = info.lines;
    const problem = (column: string, message: string): void => {
      problems.push({ row: r, line, column, message });
    };
    if (record.length !== header.length) {
      problem("(row)", `has ${record.length} fields, the header has ${header.length}`);
      continue;
    }
    const cell = (c: string): string => record[index.get(c) as number] as string;
    const id = cell("id");
    if (id === "") {
      problem("id", "is empty");
      continue;
    }
    const firstRow = seenIds.get(id);
    if (firstRow !== undefined) {
      problem("id", `'${id}' repeats row ${firstRow}`);
      continue;
    }
    const ra = Number(cell("ra_deg"));
    if (cell("ra_deg") === "" || !Number.isFinite(ra) || ra < -360 || ra > 360) {
      problem("ra_deg", `'${cell("ra_deg")}' is not a right ascension in degrees`);
      continue;
    }
    const dec = Number(cell("dec_deg"));
    if (cell("dec_deg") === "" || !Number.isFinite(dec) || dec < -90 || dec > 90) {
      problem("dec_deg", `'${cell("dec_deg")}' is not a declination in [-90, 90] degrees`);
      continue;
    }
    const opt: Partial<Record<OptionalKey, number | null>> = {};
    let bad = false;
    for (const c of OPTIONAL) {
      if (!index.has(c)) {
        opt[c] = null;
        continue;
      }
      const s = cell(c);
      if (s === "" || s.toLowerCase() === "nan") {
        opt[c] = null;
        continue;
      }
      const x = Number(s);
      if (!Number.isFinite(x)) {
        problem(c, `'${s}' is not a number`);
        bad = true;
        break;
      }
      if (!RULES[c].ok(x)) {
        problem(c, `${s} ${RULES[c].why}`);
        bad = true;
        break;
      }
      opt[c] = x;
    }
    if (bad) continue;
    const extra: Record<string, string> = {};
    for (const c of extraColumns) extra[c] = cell(c);
    seenIds.set(id, r);
    rows.push({
      id,
      raDeg: ra < 0 ? ra + 360 : ra >= 360 ? ra - 360 : ra,
      decDeg: dec,
      theta500Arcmin: opt.theta500_arcmin ?? null,
      z: opt.z ?? null,
      m500Msun: opt.m500_msun ?? null,
      teKeV: opt.te_kev ?? null,
      extra,
    });
  }
  return { rows, problems, extraColumns };
}
