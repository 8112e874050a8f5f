/**
 * Fuzzing the FITS reader: 600 mutated copies of the fixtures (byte flips, truncations, header card
 * edits, gzip wrapping) from a fixed seed, each read with both output types (float64 and float32).
 * Every read must either succeed or throw an UmbraError — never another exception — and finish
 * promptly (a guard against endless loops, not a speed test).
 */
import { gzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { createRng, isUmbraError, type Rng } from "@umbra/core";
import { parseFitsImage, parseFitsLayout } from "../src/fits/index.js";
import { fixtureBytes } from "./fits-support.js";

const FILES = [
  "f64_nan.fits",
  "f32_nan.fits",
  "i16_scaled_blank.fits",
  "i64_blank.fits",
  "u16.fits",
  "multi_ext.fits",
  "header_features.fits",
  "cube_4d_degenerate.fits",
  "rice_int16.fits",
  "gzip_float32.fits",
  "hcompress_int16.fits",
  "rice_float32_dither.fits",
];

const CARD_VALUES = ["0", "-1", "1", "999999999", "-2147483648", "2880", "'IMAGE   '", "'BINTABLE'", "T", "F", "", "1.5E+300", "NaN", "(1, 2)", "'unterminated", "64", "-64", "8", "3"];
const KEYWORDS = ["NAXIS   ", "NAXIS1  ", "NAXIS2  ", "NAXIS3  ", "BITPIX  ", "BLANK   ", "BSCALE  ", "BZERO   ", "PCOUNT  ", "GCOUNT  ", "ZNAXIS1 ", "ZTILE1  ", "ZBITPIX ", "TFORM1  ", "ZIMAGE  ", "XTENSION", "END     ", "CONTINUE", "EXTNAME ", "SIMPLE  "];

function pick<T>(rng: Rng, list: readonly T[]): T {
  return list[Math.floor(rng.uniform() * list.length)] as T;
}

/** One mutated copy of `bytes`. */
function mutate(rng: Rng, bytes: Uint8Array): { bytes: Uint8Array; how: string } {
  const out = bytes.slice();
  const kind = Math.floor(rng.uniform() * 5);
  if (kind === 0) {
    const flips = 1 + Math.floor(rng.uniform() * 8);
    for (let i = 0; i < flips; i++) {
      const inHeader = rng.uniform() < 0.7;
      const p = Math.floor(rng.uniform() * (inHeader ? Math.min(out.length, 2880 * 2) : out.length));
      out[p] = Math.floor(rng.uniform() * 256);
    }
    return { bytes: out, how: `flip ${flips}` };
  }
  if (kind === 1) {
    const n = Math.floor(rng.uniform() * out.length);
    return { bytes: out.subarray(0, n), how: `truncate ${n}` };
  }
  // edit a header card: a known keyword's value, or a random card's keyword
  const cards: number[] = [];
  for (let p = 0; p + 80 <= out.length && cards.length < 2000; p += 80) {
    const k = Buffer.from(out.subarray(p, p + 8)).toString("latin1");
    if (/^[A-Z0-9_ -]{8}$/.test(k)) cards.push(p);
  }
  const p = pick(rng, cards);
  if (kind === 2) {
    const key = pick(rng, KEYWORDS);
    out.set(Buffer.from(`${key}= ${pick(rng, CARD_VALUES).padStart(20)}`.padEnd(80), "latin1"), p);
    return { bytes: out, how: `card ${key.trim()}` };
  }
  if (kind === 3) {
    const key = Buffer.from(out.subarray(p, p + 8)).toString("latin1");
    out.set(Buffer.from(`${key}= ${pick(rng, CARD_VALUES).padStart(20)}`.padEnd(80), "latin1"), p);
    return { bytes: out, how: `value of ${key.trim()}` };
  }
  out.fill(32, p, p + 80);
  return { bytes: rng.uniform() < 0.5 ? gzipSync(out) : out, how: "blank card" };
}

describe("FITS reader fuzz", () => {
  it("600 mutated files (seed 20261201), each read as float64 and as float32, give results or UmbraErrors only, each read within 5 s", async () => {
    const rng = createRng(20261201);
    const originals = FILES.map((f) => fixtureBytes(f));
    const unexpected: string[] = [];
    let umbraErrors = 0;
    let successes = 0;
    let slowest = 0;
    for (let i = 0; i < 600; i++) {
      const which = Math.floor(rng.uniform() * FILES.length);
      const { bytes, how } = mutate(rng, originals[which] as Uint8Array);
      const hdu = pick(rng, [undefined, 0, 1, 3, "YMAP", "RICE16"] as const);
      for (const dtype of ["float64", "float32"] as const) {
        const t0 = performance.now();
        try {
          parseFitsLayout(bytes, "fuzz.fits");
          if (dtype === "float32") await parseFitsImage(bytes, "fuzz.fits", hdu === undefined ? { dtype } : { hdu, dtype });
          else await parseFitsImage(bytes, "fuzz.fits", hdu === undefined ? {} : { hdu });
          successes++;
        } catch (e) {
          if (isUmbraError(e)) umbraErrors++;
          else unexpected.push(`case ${i} ${dtype} (${FILES[which]}, ${how}, hdu ${String(hdu)}): ${e instanceof Error ? `${e.name}: ${e.message}` : String(e)}`);
        }
        slowest = Math.max(slowest, performance.now() - t0);
      }
    }
    expect(unexpected).toEqual([]);
    expect(umbraErrors).toBeGreaterThan(100);
    expect(successes).toBeGreaterThan(50);
    expect(slowest).toBeLessThan(5000);
  });
});
