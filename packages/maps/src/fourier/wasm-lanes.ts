/**
 * The float64 lane kernel of mixed-radix.ts (same Stockham autosort algorithm, same radix-4, 2, 3, 5
 * butterflies, same lane batching and the same twiddles) compiled at run time to WebAssembly with
 * 128-bit SIMD: one complex double (re, im) is exactly one f64x2 vector, so every lane of every
 * butterfly is a handful of vector operations, with no bounds checks. The module is written by
 * ../wasm/emit.ts (no toolchain; WebAssembly Core Specification 2.0). Why: docs/fft.md (the scalar JS
 * kernel left 900×600 above 2× numpy).
 *
 * Each kernel owns its own wasm memory (twiddles, one lane buffer and two work buffers), so no
 * other plan's growth can detach its views. The stage functions (wasm-stages.ts) take byte
 * pointers and strides; the row helpers (wasm-rows.ts) pack and split real row pairs.
 */
import { smoothRadices, type LaneFft } from "./mixed-radix.js";
import { writeModule } from "../wasm/emit.js";
import { wasmApi } from "../wasm/api.js";
import { rowFunctions } from "./wasm-rows.js";
import { stageFunctions } from "./wasm-stages.js";

/** Runs at least this long (doubles) are copied with TypedArray.set. */
const SET_MIN = 64;


let compiled: object | null | undefined;

/** The compiled stage module, or null where WebAssembly SIMD is unavailable (then the JS kernel is used). */
export function laneModule(): object | null {
  if (compiled !== undefined) return compiled;
  try {
    const bytes = writeModule([...stageFunctions(), ...rowFunctions()], 1);
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
