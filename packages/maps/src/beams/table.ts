/** Reading numeric text tables (beam profiles, B_ell, bandpasses). */
import { readFile } from "node:fs/promises";
import { UmbraError } from "@umbra/core";

/**
 * Parse a whitespace- or comma-separated numeric table: `#` starts a comment (whole line or
 * trailing), blank lines are skipped, each data line must hold at least `nColumns` numbers (the
 * first `nColumns` are kept). Returns one Float64Array per column.
 * @throws UmbraError BAD_DATA naming `file` and the 1-based line of the first bad line.
 */
export function parseNumericTable(text: string, nColumns: number, file = "<table>"): Float64Array[] {
  const cols: number[][] = Array.from({ length: nColumns }, () => []);
  const lines = text.split(/\r?\n/);
  for (let li = 0; li < lines.length; li++) {
    const hash = (lines[li] as string).indexOf("#");
    const body = (hash >= 0 ? (lines[li] as string).slice(0, hash) : (lines[li] as string)).trim();
    if (body === "") continue;
    const fields = body.split(/[\s,]+/).filter((f) => f !== "");
    if (fields.length < nColumns) {
      throw new UmbraError("BAD_DATA", `expected ${nColumns} numbers, found ${fields.length}: '${body}'`, { file, row: li + 1 });
    }
    for (let c = 0; c < nColumns; c++) {
      const f = fields[c] as string;
      const x = Number(f);
      if (!Number.isFinite(x)) throw new UmbraError("BAD_DATA", `column ${c + 1} '${f}' is not a finite number`, { file, row: li + 1 });
      (cols[c] as number[]).push(x);
    }
  }
  if ((cols[0] as number[]).length === 0) throw new UmbraError("BAD_DATA", "the table has no data lines", { file });
  return cols.map((c) => Float64Array.from(c));
}

/** Read a numeric text table from `path` (see {@link parseNumericTable}). @throws NOT_FOUND, BAD_DATA. */
export async function readNumericTable(path: string, nColumns: number): Promise<Float64Array[]> {
  let text: string;
  try {
    text = await readFile(path, "utf8");
  } catch {
    throw new UmbraError("NOT_FOUND", "table file not found or unreadable", { file: path });
  }
  return parseNumericTable(text, nColumns, path);
}
