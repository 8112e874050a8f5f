/** Reading a B_ell table from a FITS binary table (fitsjs-ng). */
import { readFile } from "node:fs/promises";
import { gunzipSync } from "node:zlib";
import { BinaryTable, FITS, Table } from "fitsjs-ng";
import { UmbraError } from "@umbra/core";

const ELL_NAMES = ["ELL", "L", "MULTIPOLE"];
const VALUE_NAMES = ["B_ELL", "BL", "BEAM", "WINDOW", "TEMPERATURE", "T", "INT"];

/**
 * Read (ell, B_ell) from the first table extension of a FITS file. The multipole column is the
 * one named ELL, L or MULTIPOLE (case-insensitive); without one, ell = row index. The value
 * column is `column` when given, else the first of B_ELL, BL, BEAM, WINDOW, TEMPERATURE, T, INT,
 * else the first other column. Gzipped files (`.gz`) are inflated first.
 * @throws UmbraError NOT_FOUND for a missing file; BAD_FITS when there is no usable table/column.
 */
export async function readTransferFits(path: string, column?: string): Promise<{ ell: Float64Array; bell: Float64Array }> {
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch {
    throw new UmbraError("NOT_FOUND", "B_ell FITS file not found or unreadable", { file: path });
  }
  if (bytes[0] === 0x1f && bytes[1] === 0x8b) bytes = gunzipSync(bytes);
  let fits: FITS;
  try {
    const ab = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
    fits = FITS.fromArrayBuffer(ab, { onWarning: () => undefined });
  } catch (e) {
    throw new UmbraError("BAD_FITS", `not a readable FITS file: ${(e as Error).message}`, { file: path });
  }
  const hduIndex = fits.hdus.findIndex((h) => h.data instanceof BinaryTable || h.data instanceof Table);
  const hdu = fits.hdus[hduIndex];
  if (hdu === undefined) throw new UmbraError("BAD_FITS", "no table extension holding B_ell", { file: path });
  const table = hdu.data as BinaryTable | Table;
  const names = table.columns ?? [];
  const find = (cands: readonly string[]): string | undefined => names.find((n) => cands.includes(n.trim().toUpperCase()));
  const ellName = find(ELL_NAMES);
  let valueName: string | undefined;
  if (column !== undefined) {
    valueName = names.find((n) => n.trim().toUpperCase() === column.trim().toUpperCase());
    if (valueName === undefined) throw new UmbraError("BAD_FITS", `no column '${column}' (columns: ${names.join(", ")})`, { file: path, hdu: hduIndex, field: column });
  } else {
    valueName = find(VALUE_NAMES) ?? names.find((n) => n !== ellName);
  }
  if (valueName === undefined) throw new UmbraError("BAD_FITS", `no B_ell column (columns: ${names.join(", ")})`, { file: path, hdu: hduIndex });
  const toF64 = (vals: unknown[], name: string): Float64Array => {
    const out = new Float64Array(vals.length);
    for (let i = 0; i < vals.length; i++) {
      const v = vals[i];
      const x = typeof v === "number" ? v : typeof v === "bigint" ? Number(v) : NaN;
      if (!Number.isFinite(x)) throw new UmbraError("BAD_FITS", `column ${name} holds a non-numeric or non-finite value`, { file: path, hdu: hduIndex, field: name, row: i + 1 });
      out[i] = x;
    }
    return out;
  };
  const bell = toF64(await table.getColumn(valueName), valueName);
  const ell = ellName === undefined ? Float64Array.from(bell, (_, i) => i) : toF64(await table.getColumn(ellName), ellName);
  return { ell, bell };
}
