/**
 * Decoding an uncompressed FITS data array into Float64Array or Float32Array: big-endian integers and
 * IEEE floats (FITS 4.0 §5.2–5.3; IAU FITS Working Group 2016), the linear scaling physical = BZERO +
 * BSCALE · stored (§4.4.2.5, eq. 3), and BLANK → NaN for integer arrays (§4.4.2.5, §5.2.2).
 *
 * Speed (measurements in docs/fits-reader.md): the file is read in chunks of {@link SWAP_CHUNK_BYTES}
 * into a scratch memory placed to avoid 4K aliasing ({@link scratchFor}), byte-swapped there
 * (WebAssembly SIMD, ./byteswap.ts) and copied or converted into the output while still in the CPU
 * cache, so the output is written once. Fresh outputs are allocated without a zero fill (every value
 * is written before the array is returned).
 */
import { UmbraError, type ErrorPlace } from "@umbra/core";
import { scratchFor, swapScratch, SWAP_CHUNK_BYTES, type SwapWidth } from "./byteswap.js";
import type { ByteSource } from "./source.js";

/** How stored values become physical ones. */
export interface PixelScaling {
  /** BITPIX: 8, 16, 32, 64 (integers; 8 unsigned) or −32, −64 (IEEE floats). */
  bitpix: number;
  /** BSCALE (default 1). */
  bscale: number;
  /** BZERO (default 0). */
  bzero: number;
  /** BLANK, the stored integer marking an undefined pixel, or null; ignored for float arrays. */
  blank: bigint | null;
}

/** BITPIX values whose physical values {@link decodePixelsFloat32} can return (float32 holds every 8/16-bit integer). */
export const FLOAT32_BITPIX: readonly number[] = [-32, 16, 8];

/** Fill `target` from `offset`, or throw BAD_FITS when the data end early (the layout scan should prevent it). */
function readExactly(source: ByteSource, offset: number, target: Uint8Array, place: ErrorPlace): void {
  const got = source.readInto(offset, target);
  if (got < target.length) {
    throw new UmbraError("BAD_FITS", `data unit ended after ${got} of ${target.length} bytes at byte ${offset}`, { ...place, keyword: "NAXIS" });
  }
}

/** The stored integer matching BLANK as a JavaScript number, or NaN (never equal) when absent or out of range. */
function blankNumber(blank: bigint | null, bitpix: number): number {
  if (blank === null) return NaN;
  const min = bitpix === 8 ? 0n : -(2n ** BigInt(bitpix - 1));
  const max = bitpix === 8 ? 255n : 2n ** BigInt(bitpix - 1) - 1n;
  return blank >= min && blank <= max ? Number(blank) : NaN;
}

/**
 * Decode `count` pixels stored from byte `dataOffset` of `source` into `out` (allocated when not
 * given; must hold ≥ `count` values; `place` names the file in errors). Returns the Float64Array of physical values
 * BZERO + BSCALE · stored (FITS 4.0 eq. 3), NaN where an integer equals BLANK (§4.4.2.5); float
 * values (NaN included) pass through unchanged when BSCALE = 1 and BZERO = 0.
 */
export function decodePixels(source: ByteSource, dataOffset: number, count: number, s: PixelScaling, out?: Float64Array, place: ErrorPlace = {}): Float64Array {
  if (![8, 16, 32, 64, -32, -64].includes(s.bitpix)) throw new RangeError(`unsupported BITPIX ${s.bitpix}`);
  const result = out ?? new Float64Array(uninitialised(8 * count));
  const blank = blankNumber(s.blank, s.bitpix);
  eachNativeChunk(source, dataOffset, count, Math.abs(s.bitpix) / 8, place, (scratch, k, i0) => widenChunk(scratch, k, s, blank, result, i0));
  return result;
}

/**
 * Read `count` stored values of `width` bytes from byte `dataOffset` chunk by chunk into the swap
 * scratch, byte-swapped to native order, and hand each chunk (its value count `k` and first index
 * `i0`) to `use` while it is still in the CPU cache.
 */
function eachNativeChunk(source: ByteSource, dataOffset: number, count: number, width: number, place: ErrorPlace, use: (scratch: Uint8Array, k: number, i0: number) => void): void {
  const scratch = scratchFor(dataOffset); // chunks start at dataOffset + a multiple of 4 KiB: one placement serves all
  const perChunk = SWAP_CHUNK_BYTES / width;
  for (let i0 = 0; i0 < count; i0 += perChunk) {
    const k = Math.min(perChunk, count - i0);
    readExactly(source, dataOffset + i0 * width, scratch.subarray(0, k * width), place);
    if (width > 1) swapScratch(scratch, k * width, width as SwapWidth);
    use(scratch, k, i0);
  }
}

/**
 * An ArrayBuffer of `bytes` bytes without the zero fill of `new Float64Array(n)`: every value is
 * written before the reader returns the array (an error drops it unseen). With the fill, a recycled
 * heap block is zeroed and then overwritten.
 */
function uninitialised(bytes: number): ArrayBuffer {
  const b = Buffer.allocUnsafeSlow(bytes);
  return b.buffer as ArrayBuffer;
}

/** Convert `k` native-order stored values at the start of `scratch` into `out[i0 … i0+k)` as float64. */
function widenChunk(scratch: Uint8Array, k: number, s: PixelScaling, blank: number, out: Float64Array, i0: number): void {
  const buf = scratch.buffer;
  const at = scratch.byteOffset;
  const scale = s.bscale;
  const zero = s.bzero;
  const identity = scale === 1 && zero === 0;
  switch (s.bitpix) {
    case -64: {
      const v = new Float64Array(buf, at, k);
      if (identity) out.set(v, i0);
      else for (let i = 0; i < k; i++) out[i0 + i] = zero + scale * (v[i] as number);
      break;
    }
    case -32: {
      const v = new Float32Array(buf, at, k);
      if (identity) out.set(v, i0);
      else for (let i = 0; i < k; i++) out[i0 + i] = zero + scale * (v[i] as number);
      break;
    }
    case 32:
      widenInts(new Int32Array(buf, at, k), out, i0, scale, zero, blank);
      break;
    case 16:
      widenInts(new Int16Array(buf, at, k), out, i0, scale, zero, blank);
      break;
    case 8:
      widenInts(new Uint8Array(buf, at, k), out, i0, scale, zero, blank);
      break;
    default:
      widenInt64(new Uint32Array(buf, at, 2 * k), new Int32Array(buf, at, 2 * k), k, out, i0, scale, zero, s.blank);
  }
}

/** out[i0 + i] = BLANK ? NaN : zero + scale · v[i], into a Float64Array or (rounding to nearest) a Float32Array. */
function widenInts(v: Int32Array | Int16Array | Uint8Array, out: Float64Array | Float32Array, i0: number, scale: number, zero: number, blank: number): void {
  const k = v.length;
  for (let i = 0; i < k; i++) {
    const raw = v[i] as number;
    out[i0 + i] = raw === blank ? NaN : zero + scale * raw;
  }
}

/** 64-bit integers: after the swap each value is little-endian (lo, hi) 32-bit words; value = hi·2^32 + lo. */
function widenInt64(u: Uint32Array, h: Int32Array, k: number, out: Float64Array, i0: number, scale: number, zero: number, blank: bigint | null): void {
  let blo = -1;
  let bhi = 0;
  if (blank !== null && blank >= -(2n ** 63n) && blank < 2n ** 63n) {
    blo = Number(BigInt.asUintN(32, blank));
    bhi = Number(BigInt.asIntN(32, blank >> 32n));
  }
  for (let i = 0; i < k; i++) {
    const lo = u[2 * i] as number;
    const hi = h[2 * i + 1] as number;
    out[i0 + i] = lo === blo && hi === bhi ? NaN : zero + scale * (hi * 4294967296 + lo);
  }
}

/**
 * Decode `count` pixels of an 8-bit, 16-bit or float32 array (BITPIX 8, 16, −32; see
 * {@link FLOAT32_BITPIX}) stored from byte `dataOffset` of `source` into a native-order Float32Array
 * (`out`, or a new one). Unscaled float32 values (NaN included) are the stored ones, bit for bit, as
 * astropy's `.data` holds them. With BSCALE/BZERO, or for integers, each value is the float64
 * physical value BZERO + BSCALE · stored (FITS 4.0 eq. 3) rounded once to the nearest float32, so the
 * result equals `Math.fround` of {@link decodePixels}'s (astropy instead computes in float32, which
 * can differ by an ulp). NaN where an integer equals BLANK (§4.4.2.5). RangeError for other BITPIX.
 */
export function decodePixelsFloat32(source: ByteSource, dataOffset: number, count: number, s: PixelScaling, out?: Float32Array, place: ErrorPlace = {}): Float32Array {
  if (!FLOAT32_BITPIX.includes(s.bitpix)) throw new RangeError(`BITPIX ${s.bitpix} does not fit float32 exactly`);
  const result = out ?? new Float32Array(uninitialised(4 * count));
  const scale = s.bscale;
  const zero = s.bzero;
  if (s.bitpix === -32) {
    const identity = scale === 1 && zero === 0;
    eachNativeChunk(source, dataOffset, count, 4, place, (scratch, k, i0) => {
      const v = new Float32Array(scratch.buffer, scratch.byteOffset, k);
      if (identity) result.set(v, i0);
      else for (let i = 0; i < k; i++) result[i0 + i] = zero + scale * (v[i] as number);
    });
    return result;
  }
  const blank = blankNumber(s.blank, s.bitpix);
  eachNativeChunk(source, dataOffset, count, s.bitpix / 8, place, (scratch, k, i0) => {
    const stored = s.bitpix === 16 ? new Int16Array(scratch.buffer, scratch.byteOffset, k) : new Uint8Array(scratch.buffer, scratch.byteOffset, k);
    widenInts(stored, result, i0, scale, zero, blank);
  });
  return result;
}
