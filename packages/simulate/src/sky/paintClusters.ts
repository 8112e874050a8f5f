/**
 * Clusters painted in Fourier space: each cluster's template is y0 θ500² F̃(ℓ θ500) (the flat-sky
 * transform of the projected A10 profile truncated at 5 R500, from @umbra/clusters'
 * profileFourierAtEll), divided by the pixel solid angle (the DFT of a sampled field) and shifted
 * to its sub-pixel centre by the phase exp(−2πi(k_x x_c/n_x + k_y y_c/n_y)). The result is the
 * band-limited sky sampled at pixel centres, with no pixel window and exact sub-pixel positions;
 * the transform is periodic, so a cluster near an edge wraps to the opposite edge.
 */
import { RAD_PER_ARCMIN } from "@umbra/core";
import { fourierShape, gnfwA10, profileFourierAtEll } from "@umbra/clusters";
import { shiftPhases, type SpectrumLayout } from "@umbra/maps";
import type { TrueCluster } from "./clusterTruth.js";

/** Number of nodes of each cluster's radial ℓ table (linear interpolation between them). */
const TABLE_NODES = 4096;

/**
 * Add every cluster into every target spectrum: spectra[b] += amplitudes[c][b] · y0_c · template_c,
 * with `amplitudes[c][b]` the response of target b per unit y0 of cluster c (a band's K_CMB
 * response with kSZ included, or 1 for a plain y spectrum).
 * `ells` are the modes' multipoles; `pixelSr` the pixel solid angle.
 */
export function paintClusters(
  spectra: readonly Float64Array[],
  clusters: readonly TrueCluster[],
  amplitudes: readonly Float64Array[],
  layout: SpectrumLayout,
  ells: Float64Array,
  pixelSr: number,
): void {
  if (clusters.length === 0) return;
  const shape = fourierShape(gnfwA10());
  let ellMax = 0;
  for (let m = 0; m < ells.length; m++) if (ells[m]! > ellMax) ellMax = ells[m]!;
  const dEll = (ellMax * 1.0001) / (TABLE_NODES - 2);
  const grid = new Float64Array(TABLE_NODES);
  for (let j = 0; j < TABLE_NODES; j++) grid[j] = j * dEll;
  const table = new Float64Array(TABLE_NODES);
  const { nx, ny, kxIndex, kyIndex, modeCount } = layout;
  const nkx = (nx >> 1) + 1;
  const ex = new Float64Array(2 * nkx);
  const ey = new Float64Array(2 * ny);
  const nb = spectra.length;
  const amp = new Float64Array(nb);
  // per-mode table position and wrapped ky index, shared by every cluster
  const inv = 1 / dEll;
  const node = new Int32Array(modeCount);
  const frac = new Float64Array(modeCount);
  const kyRow = new Int32Array(modeCount);
  for (let m = 0; m < modeCount; m++) {
    const t = ells[m]! * inv;
    node[m] = t | 0;
    frac[m] = t - (t | 0);
    const ky = kyIndex[m]!;
    kyRow[m] = ky < 0 ? ky + ny : ky;
  }
  let rowMajor = modeCount === ny * nkx;
  for (let m = 0; rowMajor && m < modeCount; m++) if (kxIndex[m] !== m % nkx || kyRow[m] !== kyRow[m - (m % nkx)]) rowMajor = false;
  const s0 = spectra[0]!;
  const s1 = nb > 1 ? spectra[1]! : s0;
  for (let c = 0; c < clusters.length; c++) {
    const cl = clusters[c]!;
    profileFourierAtEll(shape, cl.theta500Arcmin * RAD_PER_ARCMIN, grid, table);
    const scale = cl.y0 / pixelSr;
    for (let b = 0; b < nb; b++) amp[b] = amplitudes[c]![b]! * scale;
    shiftPhases(nx, cl.xPix, -1, "half", ex);
    shiftPhases(ny, cl.yPix, -1, "full", ey);
    const a0 = amp[0]!;
    const a1 = nb > 1 ? amp[1]! : 0;
    if (rowMajor && nb <= 2) {
      // row-major half plane (m = iy·nkx + ix): the y phase is constant along a row
      for (let iy = 0; iy < ny; iy++) {
        const br = ey[2 * kyRow[iy * nkx]!]!;
        const bi = ey[2 * kyRow[iy * nkx]! + 1]!;
        const base = iy * nkx;
        for (let ix = 0; ix < nkx; ix++) {
          const m = base + ix;
          const j = node[m]!;
          const f = table[j]! + frac[m]! * (table[j + 1]! - table[j]!);
          const ar = ex[2 * ix]!;
          const ai = ex[2 * ix + 1]!;
          const re = f * (ar * br - ai * bi);
          const im = f * (ar * bi + ai * br);
          s0[2 * m] = s0[2 * m]! + a0 * re;
          s0[2 * m + 1] = s0[2 * m + 1]! + a0 * im;
          if (nb === 2) {
            s1[2 * m] = s1[2 * m]! + a1 * re;
            s1[2 * m + 1] = s1[2 * m + 1]! + a1 * im;
          }
        }
      }
      continue;
    }
    for (let m = 0; m < modeCount; m++) {
      const j = node[m]!;
      const f = table[j]! + frac[m]! * (table[j + 1]! - table[j]!);
      const kx = kxIndex[m]!;
      const ky = kyRow[m]!;
      const ar = ex[2 * kx]!;
      const ai = ex[2 * kx + 1]!;
      const br = ey[2 * ky]!;
      const bi = ey[2 * ky + 1]!;
      const re = f * (ar * br - ai * bi);
      const im = f * (ar * bi + ai * br);
      for (let b = 0; b < nb; b++) {
        const s = spectra[b]!;
        s[2 * m] = s[2 * m]! + amp[b]! * re;
        s[2 * m + 1] = s[2 * m + 1]! + amp[b]! * im;
      }
    }
  }
}
