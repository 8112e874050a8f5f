/**
 * A minimal WebAssembly binary writer: just enough to build the FFT kernel module of
 * wasm-lanes.ts at run time (no toolchain, nothing downloaded). Encoding follows the WebAssembly
 * Core Specification 2.0 (W3C 2022), sec. 5 "Binary format", and the fixed-width SIMD opcodes of
 * that specification (sec. 5.4.8, prefix 0xFD).
 */

/** Value types (spec 5.3.1). */
export const I32 = 0x7f;
export const V128 = 0x7b;
export const F64 = 0x7c;

/** Unsigned LEB128 (spec 5.2.2). */
export function uleb(n: number): number[] {
  const out: number[] = [];
  let v = n >>> 0;
  do {
    let b = v & 0x7f;
    v >>>= 7;
    if (v !== 0) b |= 0x80;
    out.push(b);
  } while (v !== 0);
  return out;
}

/** Signed LEB128 of a 32-bit integer (spec 5.2.2). */
export function sleb(n: number): number[] {
  const out: number[] = [];
  let v = n | 0;
  for (;;) {
    const b = v & 0x7f;
    v >>= 7;
    if ((v === 0 && (b & 0x40) === 0) || (v === -1 && (b & 0x40) !== 0)) {
      out.push(b);
      return out;
    }
    out.push(b | 0x80);
  }
}

function utf8Name(s: string): number[] {
  const bytes = [...new TextEncoder().encode(s)];
  return [...uleb(bytes.length), ...bytes];
}

function section(id: number, content: number[]): number[] {
  return [id, ...uleb(content.length), ...content];
}

function vec(items: number[][]): number[] {
  return [...uleb(items.length), ...items.flat()];
}

/** One function to be written: its parameter count (all i32), extra locals and body code (without the final `end`). */
export interface FunctionBody {
  name: string;
  params: number;
  /** Extra locals after the parameters, as runs of (count, type). */
  locals: [number, number][];
  code: number[];
}

/**
 * A module that imports its memory as env.mem (at least `minPages` 64 KiB pages) and exports the
 * given functions, each taking `params` i32 arguments and returning nothing.
 */
export function writeModule(functions: readonly FunctionBody[], minPages: number): Uint8Array {
  const paramCounts = [...new Set(functions.map((f) => f.params))];
  const types = paramCounts.map((p) => [0x60, ...uleb(p), ...new Array<number>(p).fill(I32), 0x00]);
  const typeIndex = (f: FunctionBody): number => paramCounts.indexOf(f.params);
  const bytes = [
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, vec(types)),
    ...section(2, vec([[...utf8Name("env"), ...utf8Name("mem"), 0x02, 0x00, ...uleb(minPages)]])),
    ...section(3, vec(functions.map((f) => uleb(typeIndex(f))))),
    ...section(7, vec(functions.map((f, i) => [...utf8Name(f.name), 0x00, ...uleb(i)]))),
    ...section(
      10,
      vec(
        functions.map((f) => {
          const body = [...vec(f.locals.map(([count, type]) => [...uleb(count), type])), ...f.code, 0x0b];
          return [...uleb(body.length), ...body];
        }),
      ),
    ),
  ];
  return Uint8Array.from(bytes);
}

/** Opcodes used by the kernel (spec 5.4). SIMD ones are [0xfd, ...uleb(sub-opcode)]. */
export const Op = {
  block: [0x02, 0x40],
  if: [0x04, 0x40],
  loop: [0x03, 0x40],
  end: [0x0b],
  br: (depth: number) => [0x0c, ...uleb(depth)],
  brIf: (depth: number) => [0x0d, ...uleb(depth)],
  get: (i: number) => [0x20, ...uleb(i)],
  set: (i: number) => [0x21, ...uleb(i)],
  tee: (i: number) => [0x22, ...uleb(i)],
  i32: (n: number) => [0x41, ...sleb(n)],
  /** f64.load / f64.store with alignment 2^3 and a static byte offset. */
  f64Load: (offset = 0) => [0x2b, 3, ...uleb(offset)],
  f64Store: (offset = 0) => [0x39, 3, ...uleb(offset)],
  f64Mul: [0xa2],
  i32Eqz: [0x45],
  i32Ne: [0x47],
  i32LtU: [0x49],
  i32Add: [0x6a],
  i32Sub: [0x6b],
  i32Mul: [0x6c],
  i32RemU: [0x70],
  /** v128.load / v128.store with alignment 2^4 and a static byte offset. */
  vLoad: (offset = 0) => [0xfd, ...uleb(0), 4, ...uleb(offset)],
  vStore: (offset = 0) => [0xfd, ...uleb(11), 4, ...uleb(offset)],
  vConst: (a: number, b: number) => {
    const f = new Float64Array([a, b]);
    return [0xfd, ...uleb(12), ...new Uint8Array(f.buffer)];
  },
  /** i8x16.shuffle of the two operands on the stack with these 16 lane indices. */
  shuffle: (lanes: readonly number[]) => [0xfd, ...uleb(13), ...lanes],
  f64x2Add: [0xfd, ...uleb(240)],
  f64x2Sub: [0xfd, ...uleb(241)],
  f64x2Mul: [0xfd, ...uleb(242)],
} as const;
