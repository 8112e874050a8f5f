/**
 * A minimal WebAssembly binary writer: just enough to build umbra's modules at run time (the FFT
 * kernels of ../fourier/wasm-lanes.ts and wasm-transpose.ts, the FITS byte swap of
 * ../fits/byteswap.ts; no toolchain, nothing downloaded). Encoding follows the WebAssembly
 * Core Specification 2.0 (W3C 2022), sec. 5 "Binary format", and the fixed-width SIMD opcodes of
 * that specification (sec. 5.4.8, prefix 0xFD).
 */

/** Value types (spec 5.3.1). */
export const I32 = 0x7f;
export const V128 = 0x7b;
export const F64 = 0x7c;
export const F32 = 0x7d;

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
  /** i64.load / i64.store (alignment 2^3), f32.load / f32.store (alignment 2^2), f32.mul. */
  i64Load: (offset = 0) => [0x29, 3, ...uleb(offset)],
  i64Store: (offset = 0) => [0x37, 3, ...uleb(offset)],
  f32Load: (offset = 0) => [0x2a, 2, ...uleb(offset)],
  f32Store: (offset = 0) => [0x38, 2, ...uleb(offset)],
  f32Mul: [0x94],
  i32Eqz: [0x45],
  i32Ne: [0x47],
  i32LtU: [0x49],
  i32Add: [0x6a],
  i32Sub: [0x6b],
  i32Mul: [0x6c],
  i32DivU: [0x6e],
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

/** A tiny local allocator and code buffer for one function of `params` i32 parameters. */
export class Body {
  readonly c: number[] = [];
  private i32s = 0;
  private f64s = 0;
  private v128s = 0;
  private readonly plan: { kind: number; count: number }[];
  /** `params` i32 parameters; `counts`: how many extra locals of each type the function will ask for. */
  constructor(private readonly params: number, counts: { i32: number; f64: number; v128: number }) {
    this.plan = [
      { kind: I32, count: counts.i32 },
      { kind: F64, count: counts.f64 },
      { kind: V128, count: counts.v128 },
    ];
  }
  /** A fresh i32 local (index). */
  i32(): number {
    return this.params + this.i32s++;
  }
  /** A fresh f64 local (index). */
  f64(): number {
    return this.params + (this.plan[0] as { count: number }).count + this.f64s++;
  }
  /** A fresh v128 local (index). */
  v128(): number {
    return this.params + (this.plan[0] as { count: number }).count + (this.plan[1] as { count: number }).count + this.v128s++;
  }
  /** Append instructions. */
  emit(...ops: (readonly number[])[]): void {
    for (const o of ops) this.c.push(...o);
  }
  /** local d ← local a + constant (i32) */
  addTo(d: number, a: number, k: number): void {
    this.emit(Op.get(a), Op.i32(k), Op.i32Add, Op.set(d));
  }
  /** local d ← local a + local b (i32) */
  addL(d: number, a: number, b: number): void {
    this.emit(Op.get(a), Op.get(b), Op.i32Add, Op.set(d));
  }
  /** The finished function, exported as `name`. */
  done(name: string): FunctionBody {
    return { name, params: this.params, locals: this.plan.filter((p) => p.count > 0).map((p) => [p.count, p.kind] as [number, number]), code: this.c };
  }
}

/** `do { body } while (--counter != 0)` with the counter set from local `from`. */
export function countedLoop(b: Body, counter: number, from: number, body: () => void): void {
  b.emit(Op.get(from), Op.set(counter), Op.loop);
  body();
  b.emit(Op.get(counter), Op.i32(1), Op.i32Sub, Op.tee(counter), Op.brIf(0), Op.end);
}

