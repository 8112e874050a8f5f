/**
 * Decoding an uncompressed FITS data array into Float64Array: big-endian integers and IEEE floats
 * (FITS 4.0 §5.2–5.3; IAU FITS Working Group 2016), the linear scaling physical = BZERO + BSCALE ·
 * stored (§4.4.2.5, eq. 3), and BLANK → NaN for integer arrays (§4.4.2.5, §5.2.2).
 *
 * Speed: the stored bytes are read straight into the tail of the output buffer, byte-swapped there
 * with Node's native swap, and widened to float64 by a forward pass in place, so the only large
 * allocation is the output itself (see docs/fits-reader.md for why and the measurements).
 */
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

function swapped(bytes: Uint8Array, width: number): void {
  const b = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length);
  if (width === 2) b.swap16();
  else if (width === 4) b.swap32();
  else if (width === 8) b.swap64();
}

/**
 * Decode `count` pixels stored from byte `dataOffset` of `source` into `out` (allocated when not
 * given; must hold ≥ `count` values). Returns the Float64Array of physical values
 * BZERO + BSCALE · stored, NaN where an integer equals BLANK. Assumes the bytes exist (the layout
 * scan checked the data size).
 */
export function decodePixels(source: ByteSource, dataOffset: number, count: number, s: PixelScaling, out?: Float64Array): Float64Array {
  const result = out ?? new Float64Array(count);
  const width = Math.abs(s.bitpix) / 8;
  const base = result.byteOffset;
  // stored bytes go into the last width·count bytes of the 8·count output bytes
  const tail = new Uint8Array(result.buffer, base + (8 - width) * count, width * count);
  source.readInto(dataOffset, tail);
  swapped(tail, width);
  const identity = s.bscale === 1 && s.bzero === 0;
  const scale = s.bscale;
  const zero = s.bzero;
  const first = (8 - width) * count / width; // index of the first stored value in a width-sized view
  switch (s.bitpix) {
    case -64: {
      if (!identity) for (let i = 0; i < count; i++) result[i] = zero + scale * (result[i] as number);
      break;
    }
    case -32: {
      const v = new Float32Array(result.buffer, base, 2 * count);
      if (identity) for (let i = 0; i < count; i++) result[i] = v[first + i] as number;
      else for (let i = 0; i < count; i++) result[i] = zero + scale * (v[first + i] as number);
      break;
    }
    case 32:
      widenInts(new Int32Array(result.buffer, base, 2 * count), first, result, count, scale, zero, s.blank);
      break;
    case 16:
      widenInts(new Int16Array(result.buffer, base, 4 * count), first, result, count, scale, zero, s.blank);
      break;
    case 8:
      widenInts(new Uint8Array(result.buffer, base, 8 * count), first, result, count, scale, zero, s.blank);
      break;
    case 64:
      widenInt64(result, count, scale, zero, s.blank);
      break;
    default:
      throw new RangeError(`unsupported BITPIX ${s.bitpix}`);
  }
  return result;
}

/** In-place forward widening: element i is read before out[i] overwrites bytes of elements ≤ i only. */
function widenInts(
  v: Int32Array | Int16Array | Uint8Array,
  first: number,
  out: Float64Array,
  count: number,
  scale: number,
  zero: number,
  blank: bigint | null,
): void {
  const min = v instanceof Int32Array ? -2147483648 : v instanceof Int16Array ? -32768 : 0;
  const max = v instanceof Int32Array ? 2147483647 : v instanceof Int16Array ? 32767 : 255;
  const b = blank !== null && blank >= BigInt(min) && blank <= BigInt(max) ? Number(blank) : NaN; // NaN never matches
  for (let i = 0; i < count; i++) {
    const raw = v[first + i] as number;
    out[i] = raw === b ? NaN : zero + scale * raw;
  }
}

/** 64-bit integers: after swap64 each value is little-endian (lo, hi) 32-bit words; value = hi·2^32 + lo. */
function widenInt64(out: Float64Array, count: number, scale: number, zero: number, blank: bigint | null): void {
  const u = new Uint32Array(out.buffer, out.byteOffset, 2 * count);
  const h = new Int32Array(out.buffer, out.byteOffset, 2 * count);
  let blo = -1;
  let bhi = 0;
  if (blank !== null && blank >= -(2n ** 63n) && blank < 2n ** 63n) {
    blo = Number(BigInt.asUintN(32, blank));
    bhi = Number(BigInt.asIntN(32, blank >> 32n));
  }
  for (let i = 0; i < count; i++) {
    const lo = u[2 * i] as number;
    const hi = h[2 * i + 1] as number;
    out[i] = lo === blo && hi === bhi ? NaN : zero + scale * (hi * 4294967296 + lo);
  }
}
