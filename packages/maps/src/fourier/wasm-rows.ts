/**
 * WebAssembly code for the row steps of the float64 real 2-D FFT that surround the lane kernel
 * (wasm-lanes.ts), so that rows cross between JS arrays and wasm memory only by memcpy
 * (TypedArray.set) and every per-element step runs in wasm. The formulas are those of the JS driver
 * (rfft2-f64.ts): two real rows a, b packed as z = a + i·b, separated with
 * A_k = (Z_k + conj Z_{−k})/2, B_k = (Z_k − conj Z_{−k})/(2i) (Press et al. 2007, Numerical Recipes
 * 3rd ed., sec. 12.3.2), and rebuilt for the inverse as Z_k = A_k + i·B_k, Z_{n−k} = conj A_k + i·conj B_k.
 *
 * Lane layout as in the kernel: element x of lane (row pair) v at byte (x·P + v)·16, P = pairs.
 * Staged real rows: row 2v at byte 2v·nx·8, row 2v+1 right after it.
 */
import { Body, Op, countedLoop, type FunctionBody } from "../wasm/emit.js";

const SWAP = [8, 9, 10, 11, 12, 13, 14, 15, 0, 1, 2, 3, 4, 5, 6, 7];

/** packPairs(src, dst, nx, P): staged real rows → lanes z_v[x] = (row 2v)[x] + i·(row 2v+1)[x]. */
function packPairs(): FunctionBody {
  const b = new Body(4, { i32: 7, f64: 0, v128: 0 });
  const [SRC, DST, NX, P] = [0, 1, 2, 3];
  const [v, x, ra, rb, o, po, step] = [b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32()];
  b.emit(Op.get(P), Op.i32(16), Op.i32Mul, Op.set(step));
  b.emit(Op.get(SRC), Op.set(ra), Op.get(DST), Op.set(o));
  countedLoop(b, v, P, () => {
    b.emit(Op.get(ra), Op.get(NX), Op.i32(8), Op.i32Mul, Op.i32Add, Op.set(rb));
    b.emit(Op.get(o), Op.set(po));
    countedLoop(b, x, NX, () => {
      b.emit(Op.get(po), Op.get(ra), Op.f64Load(), Op.f64Store());
      b.emit(Op.get(po), Op.get(rb), Op.f64Load(), Op.f64Store(8));
      b.addL(po, po, step);
      b.addTo(ra, ra, 8);
      b.addTo(rb, rb, 8);
    });
    // next pair: lane v+1; its first row (2v+2) starts where row 2v+1 ended
    b.addTo(o, o, 16);
    b.emit(Op.get(rb), Op.set(ra));
  });
  return b.done("packPairs");
}

/** splitPairs(src, dst, nx, P, nh): lanes Z → half rows A (row 2v) and B (row 2v+1), nh complex each, at dst. */
function splitPairs(): FunctionBody {
  const b = new Body(5, { i32: 8, f64: 0, v128: 6 });
  const [SRC, DST, NX, P, NH] = [0, 1, 2, 3, 4];
  const [v, k, pz, pc, oa, ob, step, lane] = [b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32()];
  const [z, zc, conj, half, hb, u] = [b.v128(), b.v128(), b.v128(), b.v128(), b.v128(), b.v128()];
  b.emit(Op.vConst(1, -1), Op.set(conj), Op.vConst(0.5, 0.5), Op.set(half), Op.vConst(0.5, -0.5), Op.set(hb));
  b.emit(Op.get(P), Op.i32(16), Op.i32Mul, Op.set(step));
  b.emit(Op.get(SRC), Op.set(lane), Op.get(DST), Op.set(oa));
  const butterfly = (): void => {
    b.emit(Op.get(pz), Op.vLoad(), Op.set(z));
    b.emit(Op.get(pc), Op.vLoad(), Op.get(conj), Op.f64x2Mul, Op.set(zc));
    b.emit(Op.get(oa), Op.get(z), Op.get(zc), Op.f64x2Add, Op.get(half), Op.f64x2Mul, Op.vStore());
    b.emit(Op.get(z), Op.get(zc), Op.f64x2Sub, Op.set(u));
    b.emit(Op.get(ob), Op.get(u), Op.get(u), Op.shuffle(SWAP), Op.get(hb), Op.f64x2Mul, Op.vStore());
    b.addTo(oa, oa, 16);
    b.addTo(ob, ob, 16);
  };
  countedLoop(b, v, P, () => {
    // ob = oa + nh·16; k = 0 uses Z_0 twice
    b.emit(Op.get(oa), Op.get(NH), Op.i32(16), Op.i32Mul, Op.i32Add, Op.set(ob));
    b.emit(Op.get(lane), Op.set(pz), Op.get(lane), Op.set(pc));
    butterfly();
    b.emit(Op.block, Op.get(NH), Op.i32(2), Op.i32LtU, Op.brIf(0));
    // pc = lane + (nx − 1)·step; pz = lane + step
    b.emit(Op.get(lane), Op.get(NX), Op.i32(1), Op.i32Sub, Op.get(step), Op.i32Mul, Op.i32Add, Op.set(pc));
    b.addL(pz, lane, step);
    b.emit(Op.get(NH), Op.i32(1), Op.i32Sub, Op.set(k), Op.loop);
    butterfly();
    b.addL(pz, pz, step);
    b.emit(Op.get(pc), Op.get(step), Op.i32Sub, Op.set(pc));
    b.emit(Op.get(k), Op.i32(1), Op.i32Sub, Op.tee(k), Op.brIf(0), Op.end, Op.end);
    // next pair: its A row starts after this pair's B row
    b.emit(Op.get(ob), Op.set(oa));
    b.addTo(lane, lane, 16);
  });
  return b.done("splitPairs");
}

/**
 * hermitePairs(src, dst, nx, P, lastInner, even, off): packed half rows (row 2v: A, row 2v+1: B;
 * [Re X_0, (Re X_{nx/2} if even), X_1, …, X_lastInner] with X_k at byte (2k + off)·8) → lanes Z.
 */
function hermitePairs(): FunctionBody {
  const b = new Body(7, { i32: 9, f64: 0, v128: 5 });
  const [SRC, DST, NX, P, LAST, EVEN, OFF] = [0, 1, 2, 3, 4, 5, 6];
  const [v, k, ra, rb, pa, pk, pm, step, lane] = [b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32()];
  const [A, B, sb, conj, jv] = [b.v128(), b.v128(), b.v128(), b.v128(), b.v128()];
  b.emit(Op.vConst(1, -1), Op.set(conj), Op.vConst(-1, 1), Op.set(jv));
  b.emit(Op.get(P), Op.i32(16), Op.i32Mul, Op.set(step));
  b.emit(Op.get(SRC), Op.set(ra), Op.get(DST), Op.set(lane));
  countedLoop(b, v, P, () => {
    b.emit(Op.get(ra), Op.get(NX), Op.i32(8), Op.i32Mul, Op.i32Add, Op.set(rb));
    // Z_0 = (Re A_0, Re B_0)
    b.emit(Op.get(lane), Op.get(ra), Op.f64Load(), Op.f64Store());
    b.emit(Op.get(lane), Op.get(rb), Op.f64Load(), Op.f64Store(8));
    // Z_{nx/2} = (Re A_{nx/2}, Re B_{nx/2}) for even nx, at lane + (nx/2)·P·16
    b.emit(Op.get(EVEN), Op.if);
    b.emit(Op.get(NX), Op.get(P), Op.i32Mul, Op.i32(8), Op.i32Mul, Op.get(lane), Op.i32Add, Op.set(pm));
    b.emit(Op.get(pm), Op.get(ra), Op.f64Load(8), Op.f64Store());
    b.emit(Op.get(pm), Op.get(rb), Op.f64Load(8), Op.f64Store(8));
    b.emit(Op.end);
    b.emit(Op.block, Op.get(LAST), Op.i32Eqz, Op.brIf(0));
    // X_1 of row A at byte (2 + off)·8 = 16 + OFF (OFF in bytes: 0 for even nx, −8 for odd)
    b.emit(Op.get(ra), Op.get(OFF), Op.i32Add, Op.i32(16), Op.i32Add, Op.set(pa));
    b.addL(pk, lane, step);
    b.emit(Op.get(lane), Op.get(NX), Op.i32(1), Op.i32Sub, Op.get(step), Op.i32Mul, Op.i32Add, Op.set(pm));
    b.emit(Op.get(LAST), Op.set(k), Op.loop);
    b.emit(Op.get(pa), Op.vLoad(), Op.set(A));
    b.emit(Op.get(pa), Op.get(NX), Op.i32(8), Op.i32Mul, Op.i32Add, Op.vLoad(), Op.set(B));
    b.emit(Op.get(B), Op.get(B), Op.shuffle(SWAP), Op.set(sb));
    b.emit(Op.get(pk), Op.get(A), Op.get(sb), Op.get(jv), Op.f64x2Mul, Op.f64x2Add, Op.vStore());
    b.emit(Op.get(pm), Op.get(A), Op.get(conj), Op.f64x2Mul, Op.get(sb), Op.f64x2Add, Op.vStore());
    b.addTo(pa, pa, 16);
    b.addL(pk, pk, step);
    b.emit(Op.get(pm), Op.get(step), Op.i32Sub, Op.set(pm));
    b.emit(Op.get(k), Op.i32(1), Op.i32Sub, Op.tee(k), Op.brIf(0), Op.end, Op.end);
    b.emit(Op.get(rb), Op.get(NX), Op.i32(8), Op.i32Mul, Op.i32Add, Op.set(ra));
    b.addTo(lane, lane, 16);
  });
  return b.done("hermitePairs");
}

/** unpackPairs(src, dst, nx, P): lanes Z → staged real rows (row 2v = scale·Re z_v, row 2v+1 = scale·Im z_v); scale is the f64 at byte 0. */
function unpackPairs(): FunctionBody {
  const b = new Body(4, { i32: 6, f64: 1, v128: 0 });
  const [SRC, DST, NX, P] = [0, 1, 2, 3];
  const [v, x, p, oa, step, lane] = [b.i32(), b.i32(), b.i32(), b.i32(), b.i32(), b.i32()];
  const scale = b.f64();
  b.emit(Op.i32(0), Op.f64Load(), Op.set(scale));
  b.emit(Op.get(P), Op.i32(16), Op.i32Mul, Op.set(step));
  b.emit(Op.get(SRC), Op.set(lane), Op.get(DST), Op.set(oa));
  countedLoop(b, v, P, () => {
    b.emit(Op.get(lane), Op.set(p));
    countedLoop(b, x, NX, () => {
      b.emit(Op.get(oa), Op.get(p), Op.f64Load(), Op.get(scale), Op.f64Mul, Op.f64Store());
      b.emit(Op.get(oa), Op.get(NX), Op.i32(8), Op.i32Mul, Op.i32Add, Op.get(p), Op.f64Load(8), Op.get(scale), Op.f64Mul, Op.f64Store());
      b.addL(p, p, step);
      b.addTo(oa, oa, 8);
    });
    // oa now at the start of row 2v+1: skip it
    b.emit(Op.get(oa), Op.get(NX), Op.i32(8), Op.i32Mul, Op.i32Add, Op.set(oa));
    b.addTo(lane, lane, 16);
  });
  return b.done("unpackPairs");
}

/** The four row functions, to be written into the lane module. */
export function rowFunctions(): FunctionBody[] {
  return [packPairs(), splitPairs(), hermitePairs(), unpackPairs()];
}
