/**
 * Opt-in float32 real 2-D FFT on PFFFT (Pommier's SIMD FFT, compiled to WebAssembly with SIMD by
 * `@echogarden/pffft-wasm` 0.4.2). Same normalisation (types.ts) and same column-major half-plane
 * layout (layout.ts) as the float64 plan, with Float32Array buffers.
 *
 * PFFFT only takes lengths 2^a·3^b·5^c that are multiples of 32 (real, the x pass) or 16 (complex,
 * the y pass); any other size aborts inside wasm, so sizes are checked first and rejected with a
 * BAD_OPTION error. Rows go through PFFFT's ordered real transform, whose first complex slot packs
 * (F_0, F_{nx/2}); columns through its complex transform. Both passes run in place on two
 * buffers in the wasm heap (the map's rows, nx·ny floats, and the transposed half spectrum,
 * spectrumLength floats: together about one float64 band); JS only copies in and out (memcpy),
 * transposes between them in tiles and applies 1/(nx·ny). The wasm memory grows to hold them and
 * never shrinks, even after `dispose()`. Relative accuracy ~1e-7 (float32); use the float64 plan
 * for reference work.
 */
import { UmbraError } from "@umbra/core";
import type { PffftModule } from "@echogarden/pffft-wasm/simd";
import { checkDimension, checkLength } from "./rfft2-f64.js";
import { makeTransposedLayout } from "./layout.js";
import { makeTransposer, type Transposer } from "./wasm-transpose.js";
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import type { Rfft2PlanF32, SpectrumLayout } from "./types.js";
import { wasmApi } from "../wasm/api.js";

const PFFFT_FORWARD = 0;
const PFFFT_BACKWARD = 1;
const PFFFT_REAL = 0;
const PFFFT_COMPLEX = 1;

/** The PFFFT module and, when they could be built, our wasm transposes bound to its memory. */
interface Loaded {
  mod: PffftModule;
  transposer: Transposer | null;
}

let modulePromise: Promise<Loaded> | null = null;

/** The first WebAssembly.Memory among a wasm instance's exports. */
function exportedMemory(exports: Record<string, unknown>): object | null {
  const Memory = wasmApi?.Memory;
  if (Memory === undefined) return null;
  for (const v of Object.values(exports)) if (v instanceof Memory) return v;
  return null;
}

/**
 * Load PFFFT. We instantiate its wasm ourselves through the documented emscripten
 * `instantiateWasm` hook, only to get hold of its memory so that our transposes (wasm-transpose.ts)
 * can run on it; if anything in that fails, PFFFT is loaded the ordinary way and the JS transposes
 * are used.
 */
function loadPffft(): Promise<Loaded> {
  if (modulePromise === null) {
    modulePromise = import("@echogarden/pffft-wasm/simd").then(async (m) => {
      const api = wasmApi;
      let memory: object | null = null;
      try {
        if (api === undefined) throw new Error("no WebAssembly");
        const jsPath = createRequire(import.meta.url).resolve("@echogarden/pffft-wasm/simd");
        const compiled = new api.Module(readFileSync(join(dirname(jsPath), "pffft.wasm")));
        const mod = await m.default({
          instantiateWasm(imports: unknown, receive: (instance: object, module: object) => void) {
            const instance = new api.Instance(compiled, imports as Record<string, Record<string, unknown>>);
            memory = exportedMemory(instance.exports);
            receive(instance, compiled);
            return instance.exports;
          },
        });
        return { mod, transposer: memory === null ? null : makeTransposer(memory) };
      } catch {
        return { mod: await m.default(), transposer: null };
      }
    });
  }
  return modulePromise;
}

function isSmooth(n: number): boolean {
  let m = n;
  for (const p of [2, 3, 5]) while (m % p === 0) m /= p;
  return m === 1;
}

/**
 * Why PFFFT cannot take this map shape, or null when it can: nx (real rows) must be a 5-smooth
 * multiple of 32 and ny (complex columns) a 5-smooth multiple of 16.
 */
export function float32SizeProblem(nx: number, ny: number): string | null {
  if (!Number.isInteger(nx) || nx < 32 || nx % 32 !== 0 || !isSmooth(nx)) return `nx = ${nx} must be a multiple of 32 of the form 2^a·3^b·5^c`;
  if (!Number.isInteger(ny) || ny < 16 || ny % 16 !== 0 || !isSmooth(ny)) return `ny = ${ny} must be a multiple of 16 of the form 2^a·3^b·5^c`;
  return null;
}

/** Complex values per side of a transpose tile. */
const TILE = 32;

class PffftPlan implements Rfft2PlanF32 {
  readonly nx: number;
  readonly ny: number;
  readonly layout: SpectrumLayout;
  private readonly mod: PffftModule;
  private rowSetup: number;
  private colSetup: number;
  private readonly rows: number; // byte pointer: nx·ny floats, the map's rows (transformed in place)
  private readonly cols: number; // byte pointer: spectrumLength floats, the transposed half spectrum
  private readonly rowWork: number;
  private readonly colWork: number;
  private heap: Float32Array | null = null;
  private rowsView: Float32Array = new Float32Array(0);
  private colsView: Float32Array = new Float32Array(0);
  private rows64: Float64Array = new Float64Array(0); // the same rows, one complex float32 pair per element
  private cols64: Float64Array = new Float64Array(0);
  private scaleView: Float64Array = new Float64Array(1);
  private disposed = false;
  private readonly transposer: Transposer | null;
  private readonly scalePtr: number; // byte pointer of one f64: 1/(nx·ny) for the wasm inverse transpose

  /** `transposer`: our wasm transposes on PFFFT's memory, or null for the JS ones. */
  constructor(mod: PffftModule, nx: number, ny: number, transposer: Transposer | null) {
    this.mod = mod;
    this.transposer = transposer;
    this.nx = nx;
    this.ny = ny;
    this.layout = makeTransposedLayout(nx, ny);
    this.rowSetup = mod._pffft_new_setup(nx, PFFFT_REAL);
    this.colSetup = mod._pffft_new_setup(ny, PFFFT_COMPLEX);
    if (this.rowSetup === 0 || this.colSetup === 0) throw new UmbraError("INTERNAL", `PFFFT refused the sizes ${nx}×${ny}`, { field: "nx" });
    this.rows = mod._pffft_aligned_malloc(4 * nx * ny);
    this.cols = mod._pffft_aligned_malloc(4 * this.layout.spectrumLength);
    this.rowWork = mod._pffft_aligned_malloc(4 * nx);
    this.colWork = mod._pffft_aligned_malloc(8 * ny);
    this.scalePtr = mod._pffft_aligned_malloc(16);
    if (this.rows === 0 || this.cols === 0) throw new UmbraError("BAD_DATA", `not enough wasm memory for a ${nx}×${ny} float32 FFT plan`, { field: "nx" });
  }

  /** The heap views, re-made only when the wasm memory has grown (which replaces its buffer). */
  private views(): Float32Array {
    if (this.disposed) throw new UmbraError("BAD_OPTION", "this float32 FFT plan was disposed", { field: "plan" });
    const heap = this.mod.HEAPF32;
    if (heap !== this.heap) {
      this.heap = heap;
      this.rowsView = heap.subarray(this.rows >> 2, (this.rows >> 2) + this.nx * this.ny);
      this.colsView = heap.subarray(this.cols >> 2, (this.cols >> 2) + this.layout.spectrumLength);
      this.rows64 = new Float64Array(heap.buffer, this.rows, (this.nx * this.ny) >> 1);
      this.cols64 = new Float64Array(heap.buffer, this.cols, this.layout.spectrumLength >> 1);
      this.scaleView = new Float64Array(heap.buffer, this.scalePtr, 1);
    }
    return heap;
  }

  forward(map: Float32Array, spectrum: Float32Array): void {
    const { nx, ny, mod } = this;
    checkLength("map", map, nx * ny);
    checkLength("spectrum", spectrum, this.layout.spectrumLength);
    this.views();
    const a = this.rowsView;
    const b = this.colsView;
    a.set(map);
    for (let y = 0; y < ny; y++) {
      const p = this.rows + 4 * y * nx;
      mod._pffft_transform_ordered(this.rowSetup, p, p, this.rowWork, PFFFT_FORWARD);
    }
    const half = nx >> 1;
    const col = 2 * ny;
    if (this.transposer !== null) this.transposer.fwdT(this.rows, this.cols, half, ny);
    else this.transposeForwardJs(half);
    // rows (F_0, F_{nx/2}), F_1, … F_{nx/2−1} → columns k = 0 … nx/2, each ny complex; slot 0 of
    // a row packs (F_0, F_{nx/2}) and is unpacked here, after the transpose
    for (let y = 0; y < ny; y++) {
      b[2 * y] = a[y * nx] as number;
      b[2 * y + 1] = 0;
      b[half * col + 2 * y] = a[y * nx + 1] as number;
      b[half * col + 2 * y + 1] = 0;
    }
    for (let k = 0; k <= half; k++) {
      const p = this.cols + 4 * k * col;
      mod._pffft_transform_ordered(this.colSetup, p, p, this.colWork, PFFFT_FORWARD);
    }
    spectrum.set(b);
  }

  /** The forward transpose in JS (when the wasm one is unavailable), pairs k = 1 … half−1. */
  private transposeForwardJs(half: number): void {
    const ny = this.ny;
    // each complex float32 pair moves as one 8-byte element (faster than two float32 moves,
    // docs/fft.md; bit patterns are kept, only a NaN payload could be quieted)
    const a64 = this.rows64;
    const b64 = this.cols64;
    for (let y0 = 0; y0 < ny; y0 += TILE) {
      const y1 = Math.min(ny, y0 + TILE);
      for (let k0 = 1; k0 < half; k0 += TILE) {
        const k1 = Math.min(half, k0 + TILE);
        for (let k = k0; k < k1; k++) {
          let o = k * ny + y0;
          for (let y = y0, i = y0 * half + k; y < y1; y++, i += half, o++) b64[o] = a64[i] as number;
        }
      }
    }
  }

  inverse(spectrum: Float32Array, map: Float32Array): void {
    const { nx, ny, mod } = this;
    checkLength("spectrum", spectrum, this.layout.spectrumLength);
    checkLength("map", map, nx * ny);
    this.views();
    const a = this.rowsView;
    const b = this.colsView;
    b.set(spectrum);
    const half = nx >> 1;
    const col = 2 * ny;
    for (let k = 0; k <= half; k++) {
      const p = this.cols + 4 * k * col;
      mod._pffft_transform_ordered(this.colSetup, p, p, this.colWork, PFFFT_BACKWARD);
    }
    // 1/(nx·ny) is applied here, while transposing back (the row transforms are linear: saves a
    // pass over the map); then slot 0 of each row packs (Re F_0, Re F_{nx/2}): the imaginary parts
    // of kx = 0 and nx/2 are dropped, as numpy's irfft does
    const scale = 1 / (nx * ny);
    if (this.transposer !== null) {
      this.scaleView[0] = scale;
      this.transposer.invT(this.cols, this.rows, half, ny, this.scalePtr);
    } else this.transposeInverseJs(half, scale);
    for (let y = 0; y < ny; y++) {
      a[y * nx] = (b[2 * y] as number) * scale;
      a[y * nx + 1] = (b[half * col + 2 * y] as number) * scale;
    }
    for (let y = 0; y < ny; y++) {
      const p = this.rows + 4 * y * nx;
      mod._pffft_transform_ordered(this.rowSetup, p, p, this.rowWork, PFFFT_BACKWARD);
    }
    map.set(a);
  }

  /** The inverse transpose in JS (when the wasm one is unavailable), pairs k = 1 … half−1, scaled. */
  private transposeInverseJs(half: number, scale: number): void {
    const { nx, ny } = this;
    const a = this.rowsView;
    const b = this.colsView;
    const col = 2 * ny;
    for (let y0 = 0; y0 < ny; y0 += TILE) {
      const y1 = Math.min(ny, y0 + TILE);
      for (let k0 = 1; k0 < half; k0 += TILE) {
        const k1 = Math.min(half, k0 + TILE);
        for (let k = k0; k < k1; k++) {
          let o = k * col + 2 * y0;
          for (let y = y0, i = y0 * nx + 2 * k; y < y1; y++, i += nx, o += 2) {
            a[i] = (b[o] as number) * scale;
            a[i + 1] = (b[o + 1] as number) * scale;
          }
        }
      }
    }
  }

  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    const m = this.mod;
    m._pffft_destroy_setup(this.rowSetup);
    m._pffft_destroy_setup(this.colSetup);
    for (const p of [this.rows, this.cols, this.rowWork, this.colWork, this.scalePtr]) m._pffft_aligned_free(p);
    this.rowSetup = 0;
    this.colSetup = 0;
    this.heap = null;
    this.rowsView = new Float32Array(0);
    this.colsView = new Float32Array(0);
    this.rows64 = new Float64Array(0);
    this.cols64 = new Float64Array(0);
  }
}

/**
 * Create a float32 plan for an nx × ny map on PFFFT (wasm SIMD). Opt-in fast path: about 1e-7
 * relative accuracy. Throws BAD_OPTION for shapes PFFFT cannot take (see {@link float32SizeProblem});
 * those go through the float64 plan. Each plan owns wasm memory: call `dispose()` when done.
 */
export async function createRfft2PlanFloat32(nx: number, ny: number): Promise<Rfft2PlanF32> {
  return createFloat32Plan(nx, ny, true);
}

/** {@link createRfft2PlanFloat32}; `useWasmTranspose = false` forces the JS transposes (for tests and A/B runs; not re-exported). */
export async function createFloat32Plan(nx: number, ny: number, useWasmTranspose: boolean): Promise<Rfft2PlanF32> {
  checkDimension("nx", nx);
  checkDimension("ny", ny);
  const problem = float32SizeProblem(nx, ny);
  if (problem !== null) throw new UmbraError("BAD_OPTION", `the float32 FFT cannot take a ${nx}×${ny} map: ${problem}`, { field: "nx", value: `${nx}x${ny}` });
  const { mod, transposer } = await loadPffft();
  return new PffftPlan(mod, nx, ny, useWasmTranspose ? transposer : null);
}
