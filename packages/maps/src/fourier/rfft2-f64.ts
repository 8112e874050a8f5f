/**
 * The float64 real 2-D FFT driver (normalisation: see types.ts; layout: row-major half plane, see
 * layout.ts).
 *
 * Forward: rows are transformed two at a time as one complex FFT z = a + i·b of length nx and
 * separated with A_k = (Z_k + conj Z_{−k})/2, B_k = (Z_k − conj Z_{−k})/(2i) (Press et al. 2007,
 * Numerical Recipes 3rd ed., sec. 12.3.2); `rowLanes` such pairs are packed into one lane buffer
 * and transformed together by the batched kernel (mixed-radix.ts). The half rows land in the
 * spectrum row by row. Columns are then transformed `colLanes` at a time along y, the kernel's first
 * stage reading straight from the spectrum rows and its last stage writing back into them.
 * Inverse: the columns are transformed from the spectrum straight into the output map, whose rows
 * then hold packed half rows (nx numbers: the kx = 0 and, for even nx, kx = nx/2 values keep only
 * their real parts, since numpy's irfft ignores the imaginary parts there; the trick of packing the
 * two real end points into one slot is common practice in real FFTs, e.g. Press et al. 2007 sec.
 * 12.3). Row pairs are then rebuilt as Z_k = A_k + i·B_k over the full k range (Hermitian
 * extension), inverse-transformed and written back over the same rows with the 1/(nx·ny) factor.
 *
 * Memory: the caller's map and spectrum, lane buffers of O((nx + ny)·lanes) doubles and one column
 * (2·ny doubles); no full-size scratch, and no allocation per call. The caller's spectrum is never
 * modified by the inverse.
 */
import { UmbraError } from "@umbra/core";
import { makeLaneFft } from "./bluestein.js";
import type { LaneFft } from "./mixed-radix.js";
import { WasmLanes, laneModule } from "./wasm-lanes.js";
import { halfWidth, makeRowMajorLayout } from "./layout.js";
import type { Rfft2Plan, SpectrumLayout } from "./types.js";

/** Throw BAD_VALUE unless n is an integer ≥ 1. */
export function checkDimension(name: string, n: number): void {
  if (!Number.isInteger(n) || n < 1) {
    throw new UmbraError("BAD_VALUE", `FFT size ${name} = ${String(n)} must be an integer ≥ 1`, { field: name, value: n });
  }
}

/** Throw BAD_VALUE unless `buf` has exactly `len` elements. */
export function checkLength(name: string, buf: ArrayLike<number>, len: number): void {
  if (buf.length !== len) {
    throw new UmbraError("BAD_VALUE", `${name} has length ${buf.length}, expected ${len}`, { field: name, value: buf.length });
  }
}

/**
 * Target size of a lane buffer in doubles (512 KB). Measured on the 2-core benchmark machine
 * (docs/fft.md): 2^16 was fastest among 2^11 … 2^18 at 1024², 2048², 4096² and 900×600.
 */
const LANE_DOUBLES = 1 << 16;

/** Column lane budget of the wasm path (doubles): long copy runs matter more there (docs/fft.md). */
const COL_LANE_DOUBLES = 1 << 20;

/**
 * Most lanes per batch: 32 for the JS kernel (tuned with it), 128 for the wasm one, whose column
 * pass copies runs of 2·lanes doubles between the spectrum and wasm memory (longer runs, fewer
 * copy calls; docs/fft.md).
 */
const MAX_LANES_JS = 32;
const MAX_LANES_WASM = 128;

/** Lanes per batch for length n: as many as fit in `laneDoubles`, at least 1, at most min(cap, maxLanes). */
export function laneCount(n: number, cap: number, laneDoubles = LANE_DOUBLES, maxLanes = MAX_LANES_JS): number {
  return Math.max(1, Math.min(cap, maxLanes, Math.floor(laneDoubles / (2 * n))));
}

/** Float64 plan for one (nx, ny); see the module comment. Holds buffers: one plan per thread. */
export class Rfft2PlanF64 implements Rfft2Plan {
  readonly nx: number;
  readonly ny: number;
  readonly layout: SpectrumLayout;
  private readonly nh: number;
  private readonly rowLanes: number;
  private readonly colLanes: number;
  private readonly rowFft: LaneFft;
  private readonly colFft: LaneFft;
  private readonly rowBuf: Float64Array;
  private readonly edgeBuf: Float64Array; // one column (ny complex) for kx = 0 and nx/2 in the inverse

  /**
   * Internal tuning knobs: `laneDoubles`, the target size of a row lane buffer in doubles;
   * `useWasm = false` forces the scalar JS kernel; `colLaneDoubles`, the same target for the column
   * pass (default: COL_LANE_DOUBLES with the wasm kernel, `laneDoubles` with the JS one).
   */
  constructor(nx: number, ny: number, laneDoubles = LANE_DOUBLES, useWasm = true, colLaneDoubles?: number) {
    checkDimension("nx", nx);
    checkDimension("ny", ny);
    this.nx = nx;
    this.ny = ny;
    this.nh = halfWidth(nx);
    this.layout = makeRowMajorLayout(nx, ny);
    const maxLanes = useWasm && laneModule() !== null ? MAX_LANES_WASM : MAX_LANES_JS;
    this.rowLanes = laneCount(nx, Math.ceil(ny / 2), laneDoubles, maxLanes);
    const wasm = maxLanes === MAX_LANES_WASM;
    this.colLanes = laneCount(ny, this.nh, colLaneDoubles ?? (wasm ? COL_LANE_DOUBLES : laneDoubles), maxLanes);
    this.rowFft = makeLaneFft(nx, this.rowLanes, useWasm);
    this.colFft = makeLaneFft(ny, this.colLanes, useWasm);
    this.rowBuf = this.rowFft.laneBuffer?.() ?? new Float64Array(2 * nx * this.rowLanes);
    this.edgeBuf = new Float64Array(2 * ny);
  }

  forward(map: Float64Array, spectrum: Float64Array): void {
    const { nx, ny, nh } = this;
    checkLength("map", map, nx * ny);
    checkLength("spectrum", spectrum, this.layout.spectrumLength);
    const rf = this.rowFft;
    if (rf instanceof WasmLanes) {
      for (let y0 = 0; y0 < ny; y0 += 2 * this.rowLanes) rf.forwardRows(map, spectrum, y0, Math.min(2 * this.rowLanes, ny - y0));
      this.columns(spectrum, spectrum, -1);
      return;
    }
    const buf = this.rowBuf;
    const rowLen = 2 * nh; // doubles per spectrum row
    for (let y0 = 0; y0 < ny; y0 += 2 * this.rowLanes) {
      const pairs = Math.min(this.rowLanes, Math.ceil((ny - y0) / 2));
      const L2 = 2 * pairs;
      for (let v = 0; v < pairs; v++) {
        const ra = (y0 + 2 * v) * nx;
        const off = 2 * v;
        if (y0 + 2 * v + 1 < ny) {
          const rb = ra + nx;
          for (let x = 0, o = off; x < nx; x++, o += L2) {
            buf[o] = map[ra + x] as number;
            buf[o + 1] = map[rb + x] as number;
          }
        } else {
          for (let x = 0, o = off; x < nx; x++, o += L2) {
            buf[o] = map[ra + x] as number;
            buf[o + 1] = 0;
          }
        }
      }
      this.rowFft.transform(buf, 0, L2, buf, 0, L2, pairs, -1);
      for (let v = 0; v < pairs; v++) {
        const ya = y0 + 2 * v;
        const hasB = ya + 1 < ny;
        const sa = ya * rowLen;
        const sb = sa + rowLen;
        const off = 2 * v;
        for (let k = 0; k < nh; k++) {
          const i = k * L2 + off;
          const j = (k === 0 ? 0 : nx - k) * L2 + off;
          const zr = buf[i] as number;
          const zi = buf[i + 1] as number;
          const cr = buf[j] as number;
          const ci = -(buf[j + 1] as number);
          spectrum[sa + 2 * k] = 0.5 * (zr + cr);
          spectrum[sa + 2 * k + 1] = 0.5 * (zi + ci);
          if (hasB) {
            spectrum[sb + 2 * k] = 0.5 * (zi - ci);
            spectrum[sb + 2 * k + 1] = -0.5 * (zr - cr);
          }
        }
      }
    }
    this.columns(spectrum, spectrum, -1);
  }

  /** Transform all nh columns of `src` along y (dir) into `dst` (may be `src`), colLanes columns at a time, straight from the row-major spectrum. */
  private columns(src: Float64Array, dst: Float64Array, dir: 1 | -1): void {
    const rowLen = 2 * this.nh;
    for (let k0 = 0; k0 < this.nh; k0 += this.colLanes) {
      const lanes = Math.min(this.colLanes, this.nh - k0);
      this.colFft.transform(src, 2 * k0, rowLen, dst, 2 * k0, rowLen, lanes, dir);
    }
  }

  inverse(spectrum: Float64Array, map: Float64Array): void {
    const { nx, ny, nh } = this;
    checkLength("spectrum", spectrum, this.layout.spectrumLength);
    checkLength("map", map, nx * ny);
    this.columnsIntoMap(spectrum, map);
    const scale = 1 / (nx * ny);
    const rf = this.rowFft;
    if (rf instanceof WasmLanes) {
      for (let y0 = 0; y0 < ny; y0 += 2 * this.rowLanes) rf.inverseRows(map, y0, Math.min(2 * this.rowLanes, ny - y0), scale);
      return;
    }
    const buf = this.rowBuf;
    const even = nx % 2 === 0;
    const lastInner = even ? nh - 2 : nh - 1; // last kx with a full complex value in a packed row
    const off = even ? 0 : -1; // packed row: A_k (1 ≤ k ≤ lastInner) at 2k + off
    for (let y0 = 0; y0 < ny; y0 += 2 * this.rowLanes) {
      const pairs = Math.min(this.rowLanes, Math.ceil((ny - y0) / 2));
      const L2 = 2 * pairs;
      for (let v = 0; v < pairs; v++) {
        const ya = y0 + 2 * v;
        const ra = ya * nx;
        const rb = ya + 1 < ny ? ra + nx : -1;
        const lane = 2 * v;
        // Z_k = A_k + i·B_k and Z_{n−k} = conj(A_k) + i·conj(B_k); kx = 0 and nx/2 are real
        const a0 = map[ra] as number;
        const b0 = rb >= 0 ? (map[rb] as number) : 0;
        buf[lane] = a0;
        buf[lane + 1] = b0;
        if (even && nh > 1) {
          const i = (nh - 1) * L2 + lane;
          buf[i] = map[ra + 1] as number;
          buf[i + 1] = rb >= 0 ? (map[rb + 1] as number) : 0;
        }
        for (let k = 1; k <= lastInner; k++) {
          const p = 2 * k + off;
          const ar = map[ra + p] as number;
          const ai = map[ra + p + 1] as number;
          let br = 0;
          let bi = 0;
          if (rb >= 0) {
            br = map[rb + p] as number;
            bi = map[rb + p + 1] as number;
          }
          const i = k * L2 + lane;
          buf[i] = ar - bi;
          buf[i + 1] = ai + br;
          const j = (nx - k) * L2 + lane;
          buf[j] = ar + bi;
          buf[j + 1] = br - ai;
        }
      }
      this.rowFft.transform(buf, 0, L2, buf, 0, L2, pairs, 1);
      for (let v = 0; v < pairs; v++) {
        const ra = (y0 + 2 * v) * nx;
        const lane = 2 * v;
        if (y0 + 2 * v + 1 < ny) {
          const rb = ra + nx;
          for (let x = 0, o = lane; x < nx; x++, o += L2) {
            map[ra + x] = (buf[o] as number) * scale;
            map[rb + x] = (buf[o + 1] as number) * scale;
          }
        } else {
          for (let x = 0, o = lane; x < nx; x++, o += L2) map[ra + x] = (buf[o] as number) * scale;
        }
      }
    }
  }

  /**
   * Inverse column pass from the spectrum into `map`, whose rows then hold the packed half rows
   * (nx numbers each): [Re A_0, Re A_{nx/2}, A_1, …, A_{nx/2−1}] for even nx, [Re A_0, A_1, …,
   * A_{(nx−1)/2}] for odd nx. The dropped imaginary parts are the ones numpy's irfft ignores.
   */
  private columnsIntoMap(spectrum: Float64Array, map: Float64Array): void {
    const { nx, ny, nh } = this;
    const rowLen = 2 * nh;
    const even = nx % 2 === 0;
    const lastInner = even ? nh - 2 : nh - 1;
    const off = even ? 0 : -1;
    for (let k0 = 1; k0 <= lastInner; k0 += this.colLanes) {
      const lanes = Math.min(this.colLanes, lastInner + 1 - k0);
      this.colFft.transform(spectrum, 2 * k0, rowLen, map, 2 * k0 + off, nx, lanes, 1);
    }
    const edge = this.edgeBuf;
    this.colFft.transform(spectrum, 0, rowLen, edge, 0, 2, 1, 1);
    for (let y = 0; y < ny; y++) map[y * nx] = edge[2 * y] as number;
    if (even && nh > 1) {
      this.colFft.transform(spectrum, 2 * (nh - 1), rowLen, edge, 0, 2, 1, 1);
      for (let y = 0; y < ny; y++) map[y * nx + 1] = edge[2 * y] as number;
    }
  }
}

const PLAN_CACHE_SIZE = 8;
const planCache = new Map<string, Rfft2PlanF64>();

/**
 * The cached float64 plan for an nx × ny map (nx pixels per row, ny rows), any nx, ny ≥ 1:
 * 5-smooth lengths use our mixed-radix kernel at their own size, others Bluestein; never padded.
 * The cache is per module instance, i.e. per thread (each worker gets its own plans), and keeps the
 * 8 most recently used shapes (a plan holds only lane buffers, ~1.5 MB, plus its layout's per-mode
 * arrays once a consumer asks for them, 16 bytes per mode; see {@link clearRfft2PlanCache}). A plan
 * holds scratch buffers, so it must not be shared across threads.
 */
export function getRfft2Plan(nx: number, ny: number): Rfft2Plan {
  checkDimension("nx", nx);
  checkDimension("ny", ny);
  const key = `${nx}x${ny}`;
  let plan = planCache.get(key);
  if (plan !== undefined) {
    planCache.delete(key);
    planCache.set(key, plan);
    return plan;
  }
  plan = new Rfft2PlanF64(nx, ny);
  planCache.set(key, plan);
  if (planCache.size > PLAN_CACHE_SIZE) {
    const oldest = planCache.keys().next().value;
    if (oldest !== undefined) planCache.delete(oldest);
  }
  return plan;
}

/** Drop every cached float64 plan (frees their lane buffers and layout arrays, e.g. after a run on large maps). */
export function clearRfft2PlanCache(): void {
  planCache.clear();
}
