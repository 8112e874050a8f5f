/**
 * Opt-in float32 real 2-D FFT on PFFFT (Pommier's SIMD FFT, compiled to WebAssembly with SIMD by
 * `@echogarden/pffft-wasm` 0.4.2). Same normalisation (types.ts) and same column-major half-plane
 * layout (layout.ts) as the float64 plan, with Float32Array buffers.
 *
 * PFFFT only takes lengths 2^a·3^b·5^c that are multiples of 32 (real, the x pass) or 16 (complex,
 * the y pass); any other size aborts inside wasm, so sizes are checked first and rejected with a
 * BAD_OPTION error. Rows go through PFFFT's ordered real transform, whose first complex slot packs
 * (F_0, F_{nx/2}); columns through its complex transform. The transforms work on small buffers in
 * the wasm heap; the inverse uses one JS scratch of spectrumLength floats. Relative accuracy is
 * ~1e-7 (float32); use the float64 plan for reference work.
 */
import { UmbraError } from "@umbra/core";
import type { PffftModule } from "@echogarden/pffft-wasm/simd";
import { checkDimension, checkLength } from "./rfft2-f64.js";
import { makeTransposedLayout } from "./layout.js";
import type { Rfft2PlanF32, SpectrumLayout } from "./types.js";

const PFFFT_FORWARD = 0;
const PFFFT_BACKWARD = 1;
const PFFFT_REAL = 0;
const PFFFT_COMPLEX = 1;

let modulePromise: Promise<PffftModule> | null = null;

function loadPffft(): Promise<PffftModule> {
  if (modulePromise === null) {
    modulePromise = import("@echogarden/pffft-wasm/simd").then((m) => m.default());
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

class PffftPlan implements Rfft2PlanF32 {
  readonly nx: number;
  readonly ny: number;
  readonly layout: SpectrumLayout;
  private readonly mod: PffftModule;
  private rowSetup: number;
  private colSetup: number;
  private readonly rowIn: number; // byte pointers into the wasm heap
  private readonly rowOut: number;
  private readonly rowWork: number;
  private readonly colBuf: number;
  private readonly colWork: number;
  private scratch: Float32Array | null = null;
  private disposed = false;

  constructor(mod: PffftModule, nx: number, ny: number) {
    this.mod = mod;
    this.nx = nx;
    this.ny = ny;
    this.layout = makeTransposedLayout(nx, ny);
    this.rowSetup = mod._pffft_new_setup(nx, PFFFT_REAL);
    this.colSetup = mod._pffft_new_setup(ny, PFFFT_COMPLEX);
    if (this.rowSetup === 0 || this.colSetup === 0) throw new UmbraError("INTERNAL", `PFFFT refused the sizes ${nx}×${ny}`, { field: "nx" });
    this.rowIn = mod._pffft_aligned_malloc(4 * nx);
    this.rowOut = mod._pffft_aligned_malloc(4 * nx);
    this.rowWork = mod._pffft_aligned_malloc(4 * nx);
    this.colBuf = mod._pffft_aligned_malloc(8 * ny);
    this.colWork = mod._pffft_aligned_malloc(8 * ny);
  }

  private check(): void {
    if (this.disposed) throw new UmbraError("BAD_OPTION", "this float32 FFT plan was disposed", { field: "plan" });
  }

  forward(map: Float32Array, spectrum: Float32Array): void {
    this.check();
    const { nx, ny, mod } = this;
    checkLength("map", map, nx * ny);
    checkLength("spectrum", spectrum, this.layout.spectrumLength);
    const heap = mod.HEAPF32;
    const rin = this.rowIn >> 2;
    const rout = this.rowOut >> 2;
    const half = nx >> 1;
    const col = 2 * ny;
    for (let y = 0; y < ny; y++) {
      const r = y * nx;
      for (let x = 0; x < nx; x++) heap[rin + x] = map[r + x] as number;
      mod._pffft_transform_ordered(this.rowSetup, this.rowIn, this.rowOut, this.rowWork, PFFFT_FORWARD);
      let o = 2 * y;
      spectrum[o] = heap[rout] as number;
      spectrum[o + 1] = 0;
      const nyq = half * col + 2 * y;
      spectrum[nyq] = heap[rout + 1] as number;
      spectrum[nyq + 1] = 0;
      o += col;
      for (let k = 1; k < half; k++, o += col) {
        spectrum[o] = heap[rout + 2 * k] as number;
        spectrum[o + 1] = heap[rout + 2 * k + 1] as number;
      }
    }
    const cb = this.colBuf >> 2;
    for (let k = 0; k <= half; k++) {
      const base = k * col;
      for (let i = 0; i < col; i++) heap[cb + i] = spectrum[base + i] as number;
      mod._pffft_transform_ordered(this.colSetup, this.colBuf, this.colBuf, this.colWork, PFFFT_FORWARD);
      for (let i = 0; i < col; i++) spectrum[base + i] = heap[cb + i] as number;
    }
  }

  inverse(spectrum: Float32Array, map: Float32Array): void {
    this.check();
    const { nx, ny, mod } = this;
    checkLength("spectrum", spectrum, this.layout.spectrumLength);
    checkLength("map", map, nx * ny);
    if (this.scratch === null) this.scratch = new Float32Array(this.layout.spectrumLength);
    const s = this.scratch;
    const heap = mod.HEAPF32;
    const half = nx >> 1;
    const col = 2 * ny;
    const cb = this.colBuf >> 2;
    for (let k = 0; k <= half; k++) {
      const base = k * col;
      for (let i = 0; i < col; i++) heap[cb + i] = spectrum[base + i] as number;
      mod._pffft_transform_ordered(this.colSetup, this.colBuf, this.colBuf, this.colWork, PFFFT_BACKWARD);
      for (let i = 0; i < col; i++) s[base + i] = heap[cb + i] as number;
    }
    const rin = this.rowIn >> 2;
    const rout = this.rowOut >> 2;
    const scale = 1 / (nx * ny);
    for (let y = 0; y < ny; y++) {
      let o = 2 * y;
      heap[rin] = s[o] as number; // imaginary parts of kx = 0 and nx/2 dropped, as numpy's irfft
      heap[rin + 1] = s[half * col + o] as number;
      o += col;
      for (let k = 1; k < half; k++, o += col) {
        heap[rin + 2 * k] = s[o] as number;
        heap[rin + 2 * k + 1] = s[o + 1] as number;
      }
      mod._pffft_transform_ordered(this.rowSetup, this.rowIn, this.rowOut, this.rowWork, PFFFT_BACKWARD);
      const r = y * nx;
      for (let x = 0; x < nx; x++) map[r + x] = (heap[rout + x] as number) * scale;
    }
  }

  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    const m = this.mod;
    m._pffft_destroy_setup(this.rowSetup);
    m._pffft_destroy_setup(this.colSetup);
    for (const p of [this.rowIn, this.rowOut, this.rowWork, this.colBuf, this.colWork]) m._pffft_aligned_free(p);
    this.rowSetup = 0;
    this.colSetup = 0;
  }
}

/**
 * Create a float32 plan for an nx × ny map on PFFFT (wasm SIMD). Opt-in fast path: about 1e-7
 * relative accuracy. Throws BAD_OPTION for shapes PFFFT cannot take (see {@link float32SizeProblem});
 * those go through the float64 plan. Each plan owns wasm memory: call `dispose()` when done.
 */
export async function createRfft2PlanFloat32(nx: number, ny: number): Promise<Rfft2PlanF32> {
  checkDimension("nx", nx);
  checkDimension("ny", ny);
  const problem = float32SizeProblem(nx, ny);
  if (problem !== null) throw new UmbraError("BAD_OPTION", `the float32 FFT cannot take a ${nx}×${ny} map: ${problem}`, { field: "nx", value: `${nx}x${ny}` });
  const mod = await loadPffft();
  return new PffftPlan(mod, nx, ny);
}
