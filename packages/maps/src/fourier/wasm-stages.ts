/**
 * WebAssembly code of the Stockham stages of the lane kernel (wasm-lanes.ts): one function per
 * radix (2, 3, 4, 5), with or without twiddles (the first stage has none), per direction. The
 * butterflies are those of the JS kernel (mixed-radix.ts; Stockham 1966, AFIPS 28, 229;
 * Govindaraju et al. 2008, SC'08, sec. 3), written for f64x2 vectors: a complex product a·w with
 * w = c + i·s is a·(c, c) + swap(a)·(−s, s), and i·dir·a = swap(a)·(−dir, dir) (common practice for
 * interleaved complex SIMD, no single source). Encoding: ../wasm/emit.ts.
 */
import { I32, Op, V128, type FunctionBody } from "../wasm/emit.js";

const SIN60 = Math.sqrt(3) / 2;
const C1 = Math.cos((2 * Math.PI) / 5);
const C2 = Math.cos((4 * Math.PI) / 5);
const S1 = Math.sin((2 * Math.PI) / 5);
const S2 = Math.sin((4 * Math.PI) / 5);
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

/** Every stage function: names `r{R}{f if first}{F forward | I inverse}`, 10 i32 parameters (x, xes, y, yes, m, ns, lanes, tw, sx, sy; bytes). */
export function stageFunctions(): FunctionBody[] {
  const fns: FunctionBody[] = [];
  for (const R of [2, 3, 4, 5]) for (const first of [true, false]) for (const dir of [-1, 1] as const) fns.push(stage(R, first, dir));
  return fns;
}
