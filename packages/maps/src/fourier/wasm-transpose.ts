/**
 * The two transposes of the float32 plan (rfft2-f32.ts) in WebAssembly, running on PFFFT's own
 * memory (imported), so no data crosses into JS: JS loops over typed arrays move 1.3–2.4 ns per
 * element on the benchmark machine, wasm several times less (docs/fft.md). Written by
 * ../wasm/emit.ts. Both work in 16×16 tiles of complex float32 pairs; nx/2 and ny are multiples of
 * 16 for every shape PFFFT takes (float32SizeProblem).
 *
 * - fwdT(a, b, half, ny): b[k·ny + y] = a[y·half + k] for pairs (8 bytes), k < half, y < ny;
 * - invT(b, a, half, ny, scalePtr): a[y·half + k] = s·b[k·ny + y] for each float of the pair,
 *   s the f64 at scalePtr, rounded to float32 as JS would store s·x into a Float32Array.
 * Column 0 is transposed like the others; the caller fixes the kx = 0 and nx/2 slots.
 */
import { Body, Op, countedLoop, writeModule, type FunctionBody } from "../wasm/emit.js";
import { wasmApi } from "../wasm/api.js";

const TILE = 16;
const F64_PROMOTE_F32 = [0xbb];
const F32_DEMOTE_F64 = [0xb6];

/** Tiled transpose loop nest: `move(src, dst)` moves one pair; src strides along y by `srcStepY`, dst by `dstStepY`. */
function transpose(name: string, params: number, inner: (b: Body, src: number, dst: number) => void, fromRows: boolean, setup?: (b: Body) => void): FunctionBody {
  const b = new Body(params, { i32: 12, f64: 1, v128: 0 });
  const [SRC, DST, HALF, NY] = [0, 1, 2, 3];
  const [yc, kc, kk, yy, y0, k, s, d, c16, nyT, halfT, stepY] = Array.from({ length: 12 }, () => b.i32()) as [number, number, number, number, number, number, number, number, number, number, number, number];
  setup?.(b);
  b.emit(Op.i32(TILE), Op.set(c16));
  b.emit(Op.get(NY), Op.i32(TILE), Op.i32DivU, Op.set(nyT));
  b.emit(Op.get(HALF), Op.i32(TILE), Op.i32DivU, Op.set(halfT));
  // rows side (y·half + k) strides by half·8 per y; columns side (k·ny + y) by 8
  b.emit(Op.get(HALF), Op.i32(8), Op.i32Mul, Op.set(stepY));
  b.emit(Op.i32(0), Op.set(y0));
  countedLoop(b, yc, nyT, () => {
    b.emit(Op.i32(0), Op.set(k));
    countedLoop(b, kc, halfT, () => {
      countedLoop(b, kk, c16, () => {
        const rowsAt = (): void => b.emit(Op.get(y0), Op.get(HALF), Op.i32Mul, Op.get(k), Op.i32Add, Op.i32(8), Op.i32Mul);
        const colsAt = (): void => b.emit(Op.get(k), Op.get(NY), Op.i32Mul, Op.get(y0), Op.i32Add, Op.i32(8), Op.i32Mul);
        b.emit(Op.get(SRC));
        if (fromRows) rowsAt();
        else colsAt();
        b.emit(Op.i32Add, Op.set(s), Op.get(DST));
        if (fromRows) colsAt();
        else rowsAt();
        b.emit(Op.i32Add, Op.set(d));
        countedLoop(b, yy, c16, () => {
          inner(b, s, d);
          if (fromRows) {
            b.emit(Op.get(s), Op.get(stepY), Op.i32Add, Op.set(s));
            b.addTo(d, d, 8);
          } else {
            b.addTo(s, s, 8);
            b.emit(Op.get(d), Op.get(stepY), Op.i32Add, Op.set(d));
          }
        });
        b.addTo(k, k, 1);
      });
    });
    b.addTo(y0, y0, TILE);
  });
  return b.done(name);
}

/** The module's two functions. */
function transposeFunctions(): FunctionBody[] {
  const fwd = transpose("fwdT", 4, (b, s, d) => b.emit(Op.get(d), Op.get(s), Op.i64Load(), Op.i64Store()), true);
  let scale = -1;
  const inv = transpose(
    "invT",
    5,
    (b, s, d) => {
      for (const off of [0, 4]) b.emit(Op.get(d), Op.get(s), Op.f32Load(off), F64_PROMOTE_F32, Op.get(scale), Op.f64Mul, F32_DEMOTE_F64, Op.f32Store(off));
    },
    false,
    (b) => {
      scale = b.f64();
      b.emit(Op.get(4), Op.f64Load(), Op.set(scale));
    },
  );
  return [fwd, inv];
}

/** The compiled transposes bound to one memory. */
export interface Transposer {
  fwdT(a: number, b: number, half: number, ny: number): void;
  invT(b: number, a: number, half: number, ny: number, scalePtr: number): void;
}


/** The transposes running on `memory` (a WebAssembly.Memory), or null if they cannot be built here. */
export function makeTransposer(memory: object): Transposer | null {
  try {
    if (wasmApi === undefined) return null;
    const bytes = writeModule(transposeFunctions(), 1);
    if (!wasmApi.validate(bytes)) return null;
    const ex = new wasmApi.Instance(new wasmApi.Module(bytes), { env: { mem: memory } }).exports;
    return { fwdT: ex["fwdT"] as Transposer["fwdT"], invT: ex["invT"] as Transposer["invT"] };
  } catch {
    return null;
  }
}
