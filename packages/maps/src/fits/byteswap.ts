/**
 * Byte-swapping big-endian FITS values (FITS 4.0 §5.2–5.3: all binary values are big-endian) into
 * the machine's little-endian order, 16 bytes at a time with one WebAssembly SIMD shuffle
 * (`i8x16.swizzle`, WebAssembly Core Specification 2.0 §4.4.3.7).
 *
 * Why hand-written: Node's `Buffer.swap32` swaps ~4–5 ms per 16 MB here (about one element per
 * nanosecond; it is not vectorised), a JavaScript `Uint32Array` loop ~7 ms, this SIMD loop ~0.9 ms
 * (measurements in docs/fits-reader.md). WebAssembly code can only touch its own memory, so values
 * are swapped in a small scratch memory of {@link SWAP_CHUNK_BYTES} bytes that stays in the CPU's L2
 * cache: callers either read file bytes straight into {@link scratchBytes} or copy a slice in and out.
 * Where WebAssembly SIMD is unavailable (e.g. `node --jitless`) Node's `Buffer.swapNN` is used.
 */

import { writeModule } from "../wasm/emit.js";
import { wasmApi } from "../wasm/api.js";

/** Bytes of the scratch memory (4 WebAssembly pages of 64 KiB): large enough to amortise calls, small enough for L2. */
export const SWAP_CHUNK_BYTES = 4 * 65536;

/** Widths of the values that can be swapped. */
export type SwapWidth = 2 | 4 | 8;

/** Lane order that reverses every group of `width` bytes within a 16-byte vector. */
function reverseLanes(width: SwapWidth): number[] {
  const lanes: number[] = [];
  for (let g = 0; g < 16; g += width) for (let k = width - 1; k >= 0; k--) lanes.push(g + k);
  return lanes;
}

/**
 * Code of `swap(p, n)`: for (end = p + n; p < end; p += 16) store(p, swizzle(load(p), lanes)).
 * `n` must be a multiple of 16 (the caller swaps the remainder). Opcodes: Core Spec 2.0 §5.4.
 */
function swapCode(width: SwapWidth): number[] {
  const memarg = [0x04, 0x00]; // alignment 2^4, offset 0
  return [
    0x20, 0x00, 0x20, 0x01, 0x6a, 0x21, 0x01, // n = p + n (the end)
    0x02, 0x40, 0x03, 0x40, // block, loop
    0x20, 0x00, 0x20, 0x01, 0x4f, 0x0d, 0x01, // if p >= end break
    0x20, 0x00, // address for the store
    0x20, 0x00, 0xfd, 0x00, ...memarg, // v128.load p
    0xfd, 0x0c, ...reverseLanes(width), // v128.const lanes
    0xfd, 0x0e, // i8x16.swizzle
    0xfd, 0x0b, ...memarg, // v128.store
    0x20, 0x00, 0x41, 0x10, 0x6a, 0x21, 0x00, // p += 16
    0x0c, 0x00, // continue
    0x0b, 0x0b, // end loop, end block
  ];
}

/** The module (../wasm/emit.ts): s2/s4/s8(p, n) on an imported memory of SWAP_CHUNK_BYTES. */
function moduleBytes(): Uint8Array {
  const widths: SwapWidth[] = [2, 4, 8];
  return writeModule(widths.map((w) => ({ name: `s${w}`, params: 2, locals: [], code: swapCode(w) })), SWAP_CHUNK_BYTES / 65536);
}

interface SimdSwap {
  bytes: Uint8Array;
  fns: Record<SwapWidth, (p: number, n: number) => void>;
}

let simd: SimdSwap | null | undefined;

function loadSimd(): SimdSwap | null {
  if (simd !== undefined) return simd;
  try {
    if (wasmApi === undefined) return (simd = null);
    const mem = new wasmApi.Memory({ initial: SWAP_CHUNK_BYTES / 65536 });
    const ex = new wasmApi.Instance(new wasmApi.Module(moduleBytes()), { env: { mem } }).exports;
    const fn = (k: string): ((p: number, n: number) => void) => ex[k] as (p: number, n: number) => void;
    simd = { bytes: new Uint8Array(mem.buffer, 0, SWAP_CHUNK_BYTES), fns: { 2: fn("s2"), 4: fn("s4"), 8: fn("s8") } };
    // one self-check, so a wrong module never corrupts data silently
    simd.bytes.set([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16]);
    simd.fns[4](0, 16);
    if (simd.bytes[0] !== 4 || simd.bytes[3] !== 1 || simd.bytes[15] !== 13) simd = null;
  } catch {
    simd = null; // no WebAssembly SIMD here
  }
  return simd;
}

let fallbackScratch: Uint8Array | null = null;

/**
 * The scratch bytes (length {@link SWAP_CHUNK_BYTES}) that {@link swapScratch} works on. Shared by all
 * callers in this thread: fill, swap and use it without yielding in between.
 */
export function scratchBytes(): Uint8Array {
  const s = loadSimd();
  if (s !== null) return s.bytes;
  fallbackScratch ??= new Uint8Array(SWAP_CHUNK_BYTES);
  return fallbackScratch;
}

function bufferSwap(bytes: Uint8Array, width: SwapWidth): void {
  const b = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length);
  if (width === 2) b.swap16();
  else if (width === 4) b.swap32();
  else b.swap64();
}

/**
 * Reverse the byte order of each `width`-byte value in the first `length` bytes of
 * {@link scratchBytes} (`length` a multiple of `width`, at most {@link SWAP_CHUNK_BYTES}).
 */
export function swapScratch(length: number, width: SwapWidth): void {
  const s = loadSimd();
  if (s === null) {
    bufferSwap(scratchBytes().subarray(0, length), width);
    return;
  }
  const whole = length - (length % 16);
  if (whole > 0) s.fns[width](0, whole);
  if (whole < length) bufferSwap(s.bytes.subarray(whole, length), width);
}

/**
 * Reverse the byte order of each `width`-byte value of `bytes` in place (length a multiple of
 * `width`), chunk by chunk through the scratch memory: big-endian FITS values become native
 * little-endian ones (FITS 4.0 §5.2–5.3).
 */
export function swapInPlace(bytes: Uint8Array, width: SwapWidth): void {
  if (loadSimd() === null) {
    bufferSwap(bytes, width);
    return;
  }
  const scratch = scratchBytes();
  for (let o = 0; o < bytes.length; o += SWAP_CHUNK_BYTES) {
    const part = bytes.subarray(o, Math.min(bytes.length, o + SWAP_CHUNK_BYTES));
    scratch.set(part);
    swapScratch(part.length, width);
    part.set(scratch.subarray(0, part.length));
  }
}

/** True when the WebAssembly SIMD swap is in use (false: Node's Buffer swap). */
export function simdSwapAvailable(): boolean {
  return loadSimd() !== null;
}
