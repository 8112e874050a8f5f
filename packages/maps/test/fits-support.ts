/** Shared helpers for the FITS tests: fixture paths, astropy's expected answers, card edits. */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

/** Folder of the committed FITS fixtures (repository root / fixtures / fits). */
export const FIXTURES = fileURLToPath(new URL("../../../fixtures/fits/", import.meta.url));

export interface ExpectedHdu {
  index: number;
  class: string;
  extname: string | null;
  ncards: number;
  header: Record<string, string | number | boolean | null>;
  shape?: number[];
  dtype?: string;
  pixels?: (number | null)[];
  pixels_float64?: (number | null)[];
}

/** astropy's reading of every fixture (written by fixtures/fits/make_fixtures.py). */
export const EXPECTED = JSON.parse(readFileSync(`${FIXTURES}expected.json`, "utf8")) as {
  made_by: string;
  files: Record<string, { hdus: ExpectedHdu[] }>;
};

/** Expected pixels as a Float64Array with NaN for null. */
export function expectedPixels(list: readonly (number | null)[]): Float64Array {
  return Float64Array.from(list, (v) => (v === null ? NaN : v));
}

/** The bytes of fixture `name` (a fresh copy). */
export function fixtureBytes(name: string): Uint8Array {
  return new Uint8Array(readFileSync(`${FIXTURES}${name}`));
}

/** Index of the first 80-byte card whose keyword is `keyword` in the header starting at `from`. */
export function findCard(bytes: Uint8Array, keyword: string, from = 0): number {
  const key = keyword.padEnd(8, " ");
  for (let p = from; p + 80 <= bytes.length; p += 80) {
    if (Buffer.from(bytes.buffer, bytes.byteOffset + p, 8).toString("latin1") === key) return p;
  }
  return -1;
}

/** Overwrite the card of `keyword` with `text` (padded to 80 characters); returns the edited copy. */
export function withCard(bytes: Uint8Array, keyword: string, text: string): Uint8Array {
  const out = bytes.slice();
  const p = findCard(out, keyword);
  if (p < 0) throw new Error(`no card ${keyword}`);
  out.set(Buffer.from(text.padEnd(80, " ").slice(0, 80), "latin1"), p);
  return out;
}
