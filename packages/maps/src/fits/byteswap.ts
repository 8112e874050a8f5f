/**
 * Byte-swapping big-endian FITS values (FITS 4.0 §5.2–5.3: all binary values are big-endian) into
 * the machine's little-endian order, 16 bytes at a time with one WebAssembly SIMD shuffle
 * (`i8x16.swizzle`, WebAssembly Core Specification 2.0 §4.4.3.7).
 *
 * Why hand-written: Node's `Buffer.swap32` swaps ~4–5 ms per 16 MB here (about one element per
 * nanosecond; it is not vectorised), a JavaScript `Uint32Array` loop ~7 ms, this SIMD loop ~0.3 ms
 * (measurements in docs/fits-reader.md). WebAssembly code can only touch its own memory, so values
 * are swapped in a small scratch memory that holds one chunk of {@link SWAP_CHUNK_BYTES} bytes while
 * it is in the CPU's cache: the reader reads file bytes straight into {@link scratchFor}'s chunk,
 * swaps them there and copies (or converts) them into the output once.
 * Where WebAssembly SIMD is unavailable (e.g. `node --jitless`) Node's `Buffer.swapNN` is used.
 */

import { writeModule } from "../wasm/emit.js";
import { wasmApi } from "../wasm/api.js";

/**
 * Bytes of one chunk: the reader fills, swaps and copies out this many bytes at a time. Measured on
 * 2048² float32 reads (docs/fits-reader.md): 256 KiB chunks 3.9–4.3 ms, 512 KiB 3.2–4.0, 1 MiB
 * 2.4–3.5, 2 MiB 2.5–3.5, 4 and 8 MiB no better; 2 MiB it is (per-chunk costs fall with fewer
 * reads, while the chunk still fits the 32 MiB L3 cache with room to spare).
 */
export const SWAP_CHUNK_BYTES = 32 * 65536;

/** Bytes of the scratch memory: one chunk plus one 4 KiB page of room to place it (see {@link scratchFor}). */
const SCRATCH_BYTES = SWAP_CHUNK_BYTES + 65536;

/** Widths of the values that can be swapped. */
export type SwapWidth = 2 | 4 | 8;

/** Lane order that reverses every group of `width` bytes within a 16-byte vector. */
function reverseLanes(width: SwapWidth): number[] {
  const lanes: number[] = [];
  for (let g = 0; g < 16; g += width) for (let k = width - 1; k >= 0; k--) lanes.push(g + k);
  return lanes;
}

/** Bytes swapped per loop iteration: four 16-byte vectors (unrolled: ~1.5× faster than one per iteration). */
const STEP = 64;

/**
 * Code of `swap(p, n)`: for (end = p + n; p < end; p += 64) four times store(p + 16j, swizzle(load(p + 16j), lanes)).
 * `n` must be a multiple of {@link STEP} (the caller swaps the remainder). Opcodes: Core Spec 2.0 §5.4.
 */
function swapCode(width: SwapWidth): number[] {
  const memarg = (offset: number): number[] => [0x04, offset]; // alignment 2^4, static offset < 128 (one LEB byte)
  const one = (offset: number): number[] => [
    0x20, 0x00, // address for the store
    0x20, 0x00, 0xfd, 0x00, ...memarg(offset), // v128.load p + offset
    0xfd, 0x0c, ...reverseLanes(width), // v128.const lanes
    0xfd, 0x0e, // i8x16.swizzle
    0xfd, 0x0b, ...memarg(offset), // v128.store p + offset
  ];
  return [
    0x20, 0x00, 0x20, 0x01, 0x6a, 0x21, 0x01, // n = p + n (the end)
    0x02, 0x40, 0x03, 0x40, // block, loop
    0x20, 0x00, 0x20, 0x01, 0x4f, 0x0d, 0x01, // if p >= end break
    ...one(0), ...one(16), ...one(32), ...one(48),
    0x20, 0x00, 0x41, 0xc0, 0x00, 0x6a, 0x21, 0x00, // p += 64 (sleb128 of 64 is 0xc0 0x00)
    0x0c, 0x00, // continue
    0x0b, 0x0b, // end loop, end block
  ];
}

/** The module (../wasm/emit.ts): s2/s4/s8(p, n) on an imported memory of SCRATCH_BYTES. */
function moduleBytes(): Uint8Array {
  const widths: SwapWidth[] = [2, 4, 8];
  return writeModule(widths.map((w) => ({ name: `s${w}`, params: 2, locals: [], code: swapCode(w) })), SCRATCH_BYTES / 65536);
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
    const mem = new wasmApi.Memory({ initial: SCRATCH_BYTES / 65536 });
    const ex = new wasmApi.Instance(new wasmApi.Module(moduleBytes()), { env: { mem } }).exports;
    const fn = (k: string): ((p: number, n: number) => void) => ex[k] as (p: number, n: number) => void;
    simd = { bytes: new Uint8Array(mem.buffer, 0, SCRATCH_BYTES), fns: { 2: fn("s2"), 4: fn("s4"), 8: fn("s8") } };
    // one self-check, so a wrong module never corrupts data silently
    for (let i = 0; i < STEP; i++) simd.bytes[i] = i + 1;
    simd.fns[4](0, STEP);
    if (simd.bytes[0] !== 4 || simd.bytes[3] !== 1 || simd.bytes[15] !== 13 || simd.bytes[STEP - 1] !== STEP - 3) simd = null;
  } catch {
    simd = null; // no WebAssembly SIMD here
  }
  return simd;
}

let fallbackScratch: Uint8Array | null = null;

/** The whole scratch memory ({@link SCRATCH_BYTES}), shared by all callers in this thread. */
function scratchMemory(): Uint8Array {
  const s = loadSimd();
  if (s !== null) return s.bytes;
  fallbackScratch ??= new Uint8Array(SCRATCH_BYTES);
  return fallbackScratch;
}

/** Distance of `d` from the nearest multiple of 4096, in bytes. */
function pageDistance(d: number): number {
  const r = ((d % 4096) + 4096) % 4096;
  return Math.min(r, 4096 - r);
}

/**
 * Where in the scratch memory to read file bytes that start at byte `fileOffset` of the file: a
 * chunk of {@link SWAP_CHUNK_BYTES} bytes whose start is, modulo 4 KiB, at least 1008 bytes away both
 * from the file offset and from byte 16 (where glibc places large arrays, hence most outputs).
 *
 * Why: a copy whose destination lies a few bytes ahead of its source modulo 4 KiB is several times
 * slower on x86 ("4K aliasing": a load looks as if it depended on an earlier store to the same page
 * offset). Measured here (docs/fits-reader.md): the kernel's copy of 16 MiB from the page cache took
 * 5.4 ms with the destination 8 bytes ahead, 2.5 ms with 16, 0.9 ms with ≥ 64; the same happens to
 * the copy out of the scratch. The scratch memory starts on a page boundary (WebAssembly memories are
 * page-aligned), so the offset inside it fixes the alignment.
 */
export function scratchFor(fileOffset: number): Uint8Array {
  let best = 1024;
  let bestScore = -1;
  for (const at of [1024, 2048, 3072]) {
    const score = Math.min(pageDistance(at - fileOffset), pageDistance(at - 16));
    if (score > bestScore) {
      best = at;
      bestScore = score;
    }
  }
  return scratchMemory().subarray(best, best + SWAP_CHUNK_BYTES);
}

/** A chunk of scratch at offset 0 (for benchmarks and tests); see {@link scratchFor}. */
export function scratchBytes(): Uint8Array {
  return scratchMemory().subarray(0, SWAP_CHUNK_BYTES);
}

function bufferSwap(bytes: Uint8Array, width: SwapWidth): void {
  const b = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length);
  if (width === 2) b.swap16();
  else if (width === 4) b.swap32();
  else b.swap64();
}

/**
 * Reverse the byte order of each `width`-byte value in the first `length` bytes of `chunk`, a view
 * returned by {@link scratchFor} or {@link scratchBytes} (`length` a multiple of `width`, at most
 * {@link SWAP_CHUNK_BYTES}): big-endian FITS values become native little-endian ones (FITS 4.0
 * §5.2–5.3).
 */
export function swapScratch(chunk: Uint8Array, length: number, width: SwapWidth): void {
  const s = loadSimd();
  if (s === null || chunk.buffer !== s.bytes.buffer) {
    bufferSwap(chunk.subarray(0, length), width);
    return;
  }
  const whole = length - (length % STEP);
  if (whole > 0) s.fns[width](chunk.byteOffset, whole);
  if (whole < length) bufferSwap(chunk.subarray(whole, length), width);
}

/** True when the WebAssembly SIMD swap is in use (false: Node's Buffer swap). */
export function simdSwapAvailable(): boolean {
  return loadSimd() !== null;
}
