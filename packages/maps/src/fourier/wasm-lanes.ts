/**
 * The float64 lane kernel of mixed-radix.ts (same Stockham autosort algorithm, same radix-4, 2, 3, 5
 * butterflies, same lane batching and the same twiddles) compiled at run time to WebAssembly with
 * 128-bit SIMD: one complex double (re, im) is exactly one f64x2 vector, so every lane of every
 * butterfly is a handful of vector operations, with no bounds checks. The module is written by
 * wasm-emit.ts (no toolchain; WebAssembly Core Specification 2.0). Why: docs/fft.md (the scalar JS
 * kernel left 900×600 above 2× numpy).
 *
 * Complex product a·w with w = c + i·s as vectors: a·(c, c) + swap(a)·(−s, s); i·dir·a =
 * swap(a)·(−dir, dir) (common practice for interleaved complex SIMD, no single source).
 *
 * Each kernel owns its own wasm memory (twiddles, one lane buffer and two work buffers), so no
 * other plan's growth can detach its views. Stage functions take byte pointers and strides.
 */
import { smoothRadices, type LaneFft } from "./mixed-radix.js";
import { I32, Op, V128, writeModule, type FunctionBody } from "./wasm-emit.js";
import { rowFunctions } from "./wasm-rows.js";

const SIN60 = Math.sqrt(3) / 2;
const C1 = Math.cos((2 * Math.PI) / 5);
const C2 = Math.cos((4 * Math.PI) / 5);
const S1 = Math.sin((2 * Math.PI) / 5);
const S2 = Math.sin((4 * Math.PI) / 5);
/** Runs at least this long (doubles) are copied with TypedArray.set. */
const SET_MIN = 64;
const SWAP = [8, 9, 10, 11, 12, 13, 14, 15, 0, 1, 2, 3, 4, 5, 6, 7];

// parameters of every stage function (all i32; pointers and strides in bytes)
const X = 0; // input pointer
const XES = 1; // input element stride
const Y = 2; // output pointer
const YES = 3; // output element stride
const M = 4; // butterflies per lane: n / R
const NS = 5; // product of the earlier radices
const L = 6; // lanes
const TW = 7; // this stage's twiddles: per k < NS, per p = 1 … R−1: (c, c), (−s, s)
const SX = 8; // M·XES
const SY = 9; // NS·YES
const PARAMS = 10;

/** Code of one Stockham stage of radix R for direction dir (see module comment of mixed-radix.ts). */
function stage(R: number, first: boolean, dir: 1 | -1): FunctionBody {
  let nI32 = 0;
  const i32 = (): number => PARAMS + nI32++;
  const j = i32();
  const k = i32();
  const p = i32();
  const q = i32();
  const v = i32();
  const twp = i32();
  const sxr: number[] = [X, SX]; // sxr[r] = r·SX (index 0 unused)
  const syr: number[] = [Y, SY];
  for (let r = 2; r < R; r++) sxr.push(i32());
  for (let r = 2; r < R; r++) syr.push(i32());
  let nV = 0;
  const vec = (): number => PARAMS + nI32 + nV++;
  const a = Array.from({ length: R }, vec);
  const yv = Array.from({ length: R }, vec);
  const wr = Array.from({ length: R }, vec);
  const wi = Array.from({ length: R }, vec);
  const t = Array.from({ length: 8 }, vec);
  const kc = Array.from({ length: 4 }, vec);
  const c: number[] = [];
  const emit = (...ops: (readonly number[])[]): void => {
    for (const o of ops) c.push(...o);
  };
  const bin = (op: readonly number[], d: number, x: number, y: number): void => emit(Op.get(x), Op.get(y), op, Op.set(d));
  const add = (d: number, x: number, y: number): void => bin(Op.f64x2Add, d, x, y);
  const sub = (d: number, x: number, y: number): void => bin(Op.f64x2Sub, d, x, y);
  const mul = (d: number, x: number, y: number): void => bin(Op.f64x2Mul, d, x, y);
  /** d = swap(x)·K */
  const swapMul = (d: number, x: number, K: number): void => emit(Op.get(x), Op.get(x), Op.shuffle(SWAP), Op.get(K), Op.f64x2Mul, Op.set(d));
  const constant = (d: number, lo: number, hi: number): void => emit(Op.vConst(lo, hi), Op.set(d));

  // constants of the butterfly
  if (R === 4) constant(kc[0] as number, -dir, dir);
  if (R === 3) {
    constant(kc[0] as number, 0.5, 0.5);
    constant(kc[1] as number, -dir * SIN60, dir * SIN60);
  }
  if (R === 5) {
    constant(kc[0] as number, C1, C1);
    constant(kc[1] as number, C2, C2);
    constant(kc[2] as number, -dir * S1, dir * S1);
    constant(kc[3] as number, -dir * S2, dir * S2);
  }
  for (let r = 2; r < R; r++) {
    emit(Op.get(SX), Op.i32(r), Op.i32Mul, Op.set(sxr[r] as number));
    emit(Op.get(SY), Op.i32(r), Op.i32Mul, Op.set(syr[r] as number));
  }
  emit(Op.i32(0), Op.set(j), Op.loop);
  // k = j mod NS; p = X + j·XES; q = Y + ((j − k)·R + k)·YES
  emit(Op.get(j), Op.get(NS), Op.i32RemU, Op.set(k));
  emit(Op.get(X), Op.get(j), Op.get(XES), Op.i32Mul, Op.i32Add, Op.set(p));
  emit(Op.get(Y), Op.get(j), Op.get(k), Op.i32Sub, Op.i32(R), Op.i32Mul, Op.get(k), Op.i32Add, Op.get(YES), Op.i32Mul, Op.i32Add, Op.set(q));
  if (!first) {
    emit(Op.get(TW), Op.get(k), Op.i32((R - 1) * 32), Op.i32Mul, Op.i32Add, Op.set(twp));
    for (let r = 1; r < R; r++) {
      emit(Op.get(twp), Op.vLoad(32 * (r - 1)), Op.set(wr[r] as number));
      emit(Op.get(twp), Op.vLoad(32 * (r - 1) + 16), Op.set(wi[r] as number));
    }
  }
  emit(Op.get(L), Op.set(v), Op.loop);
  emit(Op.get(p), Op.vLoad(), Op.set(a[0] as number));
  for (let r = 1; r < R; r++) {
    const ar = a[r] as number;
    emit(Op.get(p), Op.get(sxr[r] as number), Op.i32Add, Op.vLoad(), Op.set(ar));
    if (!first) {
      // a_r ← a_r·w_r
      emit(Op.get(ar), Op.get(wr[r] as number), Op.f64x2Mul, Op.get(ar), Op.get(ar), Op.shuffle(SWAP), Op.get(wi[r] as number), Op.f64x2Mul, Op.f64x2Add, Op.set(ar));
    }
  }
  const [a0, a1, a2, a3, a4] = a as [number, number, number, number, number];
  const [y0, y1, y2, y3, y4] = yv as [number, number, number, number, number];
  const [t0, t1, t2, t3, t4, t5, t6, t7] = t as [number, number, number, number, number, number, number, number];
  const [k0, k1, k2, k3] = kc as [number, number, number, number];
  if (R === 2) {
    add(y0, a0, a1);
    sub(y1, a0, a1);
  } else if (R === 4) {
    add(t0, a0, a2);
    sub(t1, a0, a2);
    add(t2, a1, a3);
    sub(t3, a1, a3);
    swapMul(t4, t3, k0); // i·dir·t3
    add(y0, t0, t2);
    add(y1, t1, t4);
    sub(y2, t0, t2);
    sub(y3, t1, t4);
  } else if (R === 3) {
    add(t0, a1, a2);
    sub(t1, a1, a2);
    mul(t2, t0, k0);
    sub(t2, a0, t2); // a0 − sum/2
    swapMul(t3, t1, k1); // i·dir·sin60·(a1 − a2)
    add(y0, a0, t0);
    add(y1, t2, t3);
    sub(y2, t2, t3);
  } else {
    add(t0, a1, a4); // p1
    sub(t1, a1, a4); // d1
    add(t2, a2, a3); // p2
    sub(t3, a2, a3); // d2
    add(y0, a0, t0);
    add(y0, y0, t2);
    // b1 = a0 + C1·p1 + C2·p2 (t4), b2 = a0 + C2·p1 + C1·p2 (t5)
    mul(t4, t0, k0);
    add(t4, a0, t4);
    mul(t6, t2, k1);
    add(t4, t4, t6);
    mul(t5, t0, k1);
    add(t5, a0, t5);
    mul(t6, t2, k0);
    add(t5, t5, t6);
    // i·e1 = swap(d1)·K1 + swap(d2)·K2 (t6), i·e2 = swap(d1)·K2 − swap(d2)·K1 (t7)
    swapMul(t6, t1, k2);
    swapMul(t7, t3, k3);
    add(t6, t6, t7);
    swapMul(t7, t1, k3);
    swapMul(t0, t3, k2);
    sub(t7, t7, t0);
    add(y1, t4, t6);
    sub(y4, t4, t6);
    add(y2, t5, t7);
    sub(y3, t5, t7);
  }
  emit(Op.get(q), Op.get(y0), Op.vStore());
  for (let r = 1; r < R; r++) emit(Op.get(q), Op.get(syr[r] as number), Op.i32Add, Op.get(yv[r] as number), Op.vStore());
  emit(Op.get(p), Op.i32(16), Op.i32Add, Op.set(p));
  emit(Op.get(q), Op.i32(16), Op.i32Add, Op.set(q));
  emit(Op.get(v), Op.i32(1), Op.i32Sub, Op.tee(v), Op.brIf(0), Op.end);
  emit(Op.get(j), Op.i32(1), Op.i32Add, Op.tee(j), Op.get(M), Op.i32LtU, Op.brIf(0), Op.end);
  return { name: `r${R}${first ? "f" : ""}${dir < 0 ? "F" : "I"}`, params: PARAMS, locals: [[nI32, I32], [nV, V128]], code: c };
}

/** The parts of the WebAssembly JS API used here (the project's type libraries do not declare it). */
interface WasmApi {
  validate(bytes: Uint8Array): boolean;
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: Record<string, Record<string, unknown>>) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number }) => { buffer: ArrayBuffer };
}

const wasmApi = (globalThis as unknown as { WebAssembly?: WasmApi }).WebAssembly;

let compiled: object | null | undefined;

/** The compiled stage module, or null where WebAssembly SIMD is unavailable (then the JS kernel is used). */
export function laneModule(): object | null {
  if (compiled !== undefined) return compiled;
  const fns: FunctionBody[] = [];
  for (const R of [2, 3, 4, 5]) for (const first of [true, false]) for (const dir of [-1, 1] as const) fns.push(stage(R, first, dir));
  fns.push(...rowFunctions());
  try {
    const bytes = writeModule(fns, 1);
    compiled = wasmApi !== undefined && wasmApi.validate(bytes) ? new wasmApi.Module(bytes) : null;
  } catch {
    compiled = null;
  }
  return compiled;
}

type StageFn = (x: number, xes: number, y: number, yes: number, m: number, ns: number, l: number, tw: number, sx: number, sy: number) => void;
type RowFns = {
  packPairs: (src: number, dst: number, nx: number, pairs: number) => void;
  splitPairs: (src: number, dst: number, nx: number, pairs: number, nh: number) => void;
  hermitePairs: (src: number, dst: number, nx: number, pairs: number, lastInner: number, even: number, offBytes: number) => void;
  unpackPairs: (src: number, dst: number, nx: number, pairs: number) => void;
};

/**
 * Batched complex FFTs of one 5-smooth length in WebAssembly SIMD (same contract as
 * {@link LaneFft}). `laneBuffer()` is a view of the kernel's own input buffer: a caller that packs
 * its lanes there compactly (element stride 2·lanes) and transforms it in place saves the copy in
 * and out. Not re-entrant.
 */
export class WasmLanes implements LaneFft {
  readonly n: number;
  readonly maxLanes: number;
  private readonly radices: number[];
  private readonly strides: number[];
  private readonly fnFwd: StageFn[];
  private readonly fnInv: StageFn[];
  private readonly twFwd: number[]; // byte pointer per stage
  private readonly twInv: number[];
  private readonly inPtr: number;
  private readonly aPtr: number;
  private readonly bPtr: number;
  private readonly heap: Float64Array;
  private readonly lanes: Float64Array;
  private readonly rows: RowFns;

  /** Throws RangeError unless n is 5-smooth and the SIMD module is available (see {@link laneModule}). */
  constructor(n: number, maxLanes: number) {
    const radices = smoothRadices(n);
    const mod = laneModule();
    if (radices === null || mod === null || wasmApi === undefined) throw new RangeError(`WasmLanes needs a 5-smooth length and WebAssembly SIMD (n = ${n})`);
    this.n = n;
    this.maxLanes = maxLanes;
    this.radices = radices;
    this.strides = [];
    let twBytes = 16; // bytes 0…15: the scale of unpackPairs
    let ns = 1;
    const twOff: number[] = [];
    for (const r of radices) {
      this.strides.push(ns);
      twOff.push(twBytes);
      twBytes += ns * (r - 1) * 32;
      ns *= r;
    }
    const bufBytes = 16 * (n + 2) * maxLanes; // n + 2: room for 2·lanes half rows of n/2 + 1 complex
    this.inPtr = 2 * twBytes;
    this.aPtr = this.inPtr + bufBytes;
    this.bPtr = this.aPtr + bufBytes;
    const memory = new wasmApi.Memory({ initial: Math.max(1, Math.ceil((this.bPtr + bufBytes) / 65536)) });
    const ex = new wasmApi.Instance(mod, { env: { mem: memory } }).exports as Record<string, StageFn>;
    this.heap = new Float64Array(memory.buffer);
    this.lanes = this.heap.subarray(this.inPtr / 8, this.inPtr / 8 + 2 * n * maxLanes);
    this.rows = ex as unknown as RowFns;
    this.twFwd = twOff;
    this.twInv = twOff.map((o) => o + twBytes - 16);
    this.fnFwd = radices.map((r, q) => ex[`r${r}${q === 0 ? "f" : ""}F`] as StageFn);
    this.fnInv = radices.map((r, q) => ex[`r${r}${q === 0 ? "f" : ""}I`] as StageFn);
    ns = 1;
    radices.forEach((r, q) => {
      for (let k = 0; k < ns; k++) {
        for (let p = 1; p < r; p++) {
          const theta = (2 * Math.PI * k * p) / (ns * r);
          const cos = Math.cos(theta);
          const sin = Math.sin(theta);
          for (const [base, dir] of [[this.twFwd[q] as number, -1], [this.twInv[q] as number, 1]] as const) {
            const i = (base + (k * (r - 1) + p - 1) * 32) / 8;
            this.heap[i] = cos;
            this.heap[i + 1] = cos;
            this.heap[i + 2] = -dir * sin;
            this.heap[i + 3] = dir * sin;
          }
        }
      }
      ns *= r;
    });
  }

  /** The kernel's input buffer (2·n·maxLanes doubles), see the class comment. */
  laneBuffer(): Float64Array {
    return this.lanes;
  }

  transform(src: Float64Array, so: number, ses: number, dst: Float64Array, dso: number, des: number, lanes: number, dir: 1 | -1): void {
    const n = this.n;
    const L2 = 2 * lanes;
    const h = this.heap;
    const base = this.inPtr / 8;
    if (!(src === this.lanes && so === 0 && ses === L2)) copyRows(src, so, ses, h, base, L2, n, L2);
    const rb = this.runStages(this.inPtr, lanes, dir) / 8;
    if (dst === this.lanes && dso === 0 && des === L2) {
      if (rb !== base) h.copyWithin(base, rb, rb + n * L2);
      return;
    }
    copyRows(h, rb, L2, dst, dso, des, this.n, L2);
  }

  /** Run every stage on compact lanes starting at byte `start` (one of the three buffers), ping-ponging between the other two; returns where the result is. */
  private runStages(start: number, lanes: number, dir: 1 | -1): number {
    const n = this.n;
    const t = this.radices.length;
    const fns = dir === -1 ? this.fnFwd : this.fnInv;
    const tws = dir === -1 ? this.twFwd : this.twInv;
    const es = 16 * lanes;
    const o1 = start === this.inPtr ? this.aPtr : this.inPtr;
    const o2 = start === this.bPtr ? this.aPtr : this.bPtr;
    let x = start;
    for (let q = 0; q < t; q++) {
      const y = q % 2 === 0 ? o1 : o2;
      const r = this.radices[q] as number;
      const ns = this.strides[q] as number;
      const m = n / r;
      (fns[q] as StageFn)(x, es, y, es, m, ns, lanes, tws[q] as number, m * es, ns * es);
      x = y;
    }
    return x;
  }

  /** A buffer other than the one at byte `p`. */
  private other(p: number): number {
    return p === this.inPtr ? this.aPtr : this.inPtr;
  }

  /**
   * Forward row step of the real 2-D FFT (n = nx): real rows y0 … y0+count−1 of `map` (count ≤
   * 2·maxLanes) → their half rows (nh = floor(nx/2)+1 complex each) in `spectrum` rows y0 …,
   * row-major. Rows cross into and out of wasm memory by memcpy only.
   */
  forwardRows(map: Float64Array, spectrum: Float64Array, y0: number, count: number): void {
    const nx = this.n;
    const nh = (nx >> 1) + 1;
    const pairs = (count + 1) >> 1;
    const h = this.heap;
    const base = this.inPtr / 8;
    h.set(map.subarray(y0 * nx, (y0 + count) * nx), base);
    if (count % 2 === 1) h.fill(0, base + count * nx, base + (count + 1) * nx);
    this.rows.packPairs(this.inPtr, this.aPtr, nx, pairs);
    const res = this.runStages(this.aPtr, pairs, -1);
    const out = this.other(res);
    this.rows.splitPairs(res, out, nx, pairs, nh);
    spectrum.set(h.subarray(out / 8, out / 8 + count * 2 * nh), y0 * 2 * nh);
  }

  /**
   * Inverse row step: packed half rows y0 … y0+count−1 of `map` (layout of rfft2-f64.ts
   * columnsIntoMap) → real rows scaled by `scale`, written back over the same rows of `map`.
   */
  inverseRows(map: Float64Array, y0: number, count: number, scale: number): void {
    const nx = this.n;
    const nh = (nx >> 1) + 1;
    const even = nx % 2 === 0;
    const pairs = (count + 1) >> 1;
    const h = this.heap;
    const base = this.inPtr / 8;
    h.set(map.subarray(y0 * nx, (y0 + count) * nx), base);
    if (count % 2 === 1) h.fill(0, base + count * nx, base + (count + 1) * nx);
    this.rows.hermitePairs(this.inPtr, this.aPtr, nx, pairs, even ? nh - 2 : nh - 1, even ? 1 : 0, even ? 0 : -8);
    const res = this.runStages(this.aPtr, pairs, 1);
    const out = this.other(res);
    h[0] = scale;
    this.rows.unpackPairs(res, out, nx, pairs);
    map.set(h.subarray(out / 8, out / 8 + count * nx), y0 * nx);
  }
}

/**
 * Copy `rows` runs of `len` doubles from src (offset so, stride ses) to dst (offset dso, stride des):
 * long runs through TypedArray.set (memcpy), short ones by an unrolled loop (measured faster than a
 * plain element loop, docs/fft.md).
 */
function copyRows(src: Float64Array, so: number, ses: number, dst: Float64Array, dso: number, des: number, rows: number, len: number): void {
  if (len >= SET_MIN) {
    for (let i = 0, s = so, d = dso; i < rows; i++, s += ses, d += des) dst.set(src.subarray(s, s + len), d);
    return;
  }
  const len4 = len & ~3;
  for (let i = 0, s = so, d = dso; i < rows; i++, s += ses, d += des) {
    let v = 0;
    for (; v < len4; v += 4) {
      const a = src[s + v] as number;
      const b = src[s + v + 1] as number;
      const c = src[s + v + 2] as number;
      const e = src[s + v + 3] as number;
      dst[d + v] = a;
      dst[d + v + 1] = b;
      dst[d + v + 2] = c;
      dst[d + v + 3] = e;
    }
    for (; v < len; v++) dst[d + v] = src[s + v] as number;
  }
}
