/**
 * A user's C_ℓ table: whitespace- or comma-separated text, `#` comments, first column ℓ, second
 * column D_ℓ = ℓ(ℓ+1)C_ℓ/2π in µK² (`dell_uK2`, the convention of published best-fit files) or
 * C_ℓ in µK²·sr (`cl_uK2`). Rows of other columns are ignored beyond the second.
 */
import { UmbraError } from "@umbra/core";

/** How the second column of a C_ℓ table is expressed. */
export type ClColumn = "dell_uK2" | "cl_uK2";

/** A parsed C_ℓ table in K_CMB²·sr, ℓ strictly increasing. */
export interface ClTable {
  ell: Float64Array;
  clK2: Float64Array;
}

/**
 * Parse a C_ℓ table (see module comment) into C_ℓ in K²·sr. Problems (non-numeric cells,
 * non-increasing ℓ, negative power) are all reported at once as BAD_SCENARIO naming `file` and rows.
 */
export function parseClTable(text: string, column: ClColumn, file: string): ClTable {
  const ell: number[] = [];
  const cl: number[] = [];
  const problems: string[] = [];
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i]!.replace(/#.*/, "").trim();
    if (line === "") continue;
    const cells = line.split(/[\s,]+/);
    const l = Number(cells[0]);
    const v = Number(cells[1]);
    if (cells.length < 2 || !Number.isFinite(l) || !Number.isFinite(v)) {
      if (ell.length === 0 && !Number.isFinite(l)) continue; // a header line before the data
      problems.push(`row ${i + 1}: expected two numbers (ell, value), got '${line.slice(0, 40)}'`);
      continue;
    }
    if (ell.length > 0 && !(l > ell[ell.length - 1]!)) problems.push(`row ${i + 1}: ell ${l} does not increase`);
    if (v < 0) problems.push(`row ${i + 1}: negative power ${v}`);
    ell.push(l);
    cl.push(column === "dell_uK2" ? (l > 0 ? (2 * Math.PI * v) / (l * (l + 1)) : 0) * 1e-12 : v * 1e-12);
  }
  if (ell.length < 2) problems.push("fewer than two data rows");
  if (problems.length > 0) throw new UmbraError("BAD_SCENARIO", `C_ell table has ${problems.length} problem(s): ${problems[0]}`, { file }, problems);
  return { ell: Float64Array.from(ell), clK2: Float64Array.from(cl) };
}

