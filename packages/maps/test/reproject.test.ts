import { describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import { keysKernel, reproject, sameGrid, sampleBicubic, sampleBilinear } from "../src/reproject/index.js";
import { pixelToWorldArray, wcsFromHeader } from "../src/wcs/index.js";
import type { Wcs } from "../src/wcs/types.js";
import type { SkyMap } from "../src/types.js";

const D2R = Math.PI / 180;
const header = (cards: Record<string, string | number>) => ({ get: (k: string) => cards[k] });

function tanWcs(crpix: number, pixArcmin: number, rotDeg: number, extra: Record<string, string | number> = {}): Wcs {
  const d = pixArcmin / 60;
  const c = Math.cos(rotDeg * D2R);
  const s = Math.sin(rotDeg * D2R);
  return wcsFromHeader(
    header({ CTYPE1: "RA---TAN", CTYPE2: "DEC--TAN", CRVAL1: 150, CRVAL2: 2, CRPIX1: crpix, CRPIX2: crpix, CD1_1: -d * c, CD1_2: d * s, CD2_1: d * s, CD2_2: d * c, ...extra }),
  );
}

/** A map whose pixels hold f(sky position), evaluated exactly at each pixel centre. */
function mapOf(nx: number, ny: number, wcs: Wcs, f: (lon: number, lat: number) => number): SkyMap {
  const ix = new Float64Array(nx * ny);
  const iy = new Float64Array(nx * ny);
  for (let k = 0; k < nx * ny; k++) {
    ix[k] = k % nx;
    iy[k] = Math.floor(k / nx);
  }
  const { lonDeg, latDeg } = pixelToWorldArray(wcs, ix, iy);
  const data = new Float64Array(nx * ny);
  for (let k = 0; k < data.length; k++) data[k] = f(lonDeg[k] as number, latDeg[k] as number);
  return { data, nx, ny, wcs, unit: "K_CMB" };
}

/** Gaussian blob of σ (arcmin) on the sky around (150.02, 2.01), peak 1; distance by the haversine formula. */
function blob(sigmaArcmin: number) {
  const lon0 = 150.02 * D2R;
  const lat0 = 2.01 * D2R;
  return (lon: number, lat: number): number => {
    const a = Math.sin((lat * D2R - lat0) / 2) ** 2 + Math.cos(lat * D2R) * Math.cos(lat0) * Math.sin((lon * D2R - lon0) / 2) ** 2;
    const dArcmin = (2 * Math.asin(Math.sqrt(a))) / D2R * 60;
    return Math.exp(-(dArcmin * dArcmin) / (2 * sigmaArcmin * sigmaArcmin));
  };
}

describe("interpolation kernels", () => {
  it("Keys kernel (a = −1/2) is 1 at 0, 0 at the other integers, and its weights sum to 1", () => {
    expect([keysKernel(0), keysKernel(1), keysKernel(2), keysKernel(-1), keysKernel(2.5)]).toEqual([1, 0, 0, 0, 0]);
    for (const t of [0.1, 0.37, 0.5, 0.93]) {
      expect(keysKernel(1 + t) + keysKernel(t) + keysKernel(1 - t) + keysKernel(2 - t)).toAllClose(1, { rtol: 1e-15 });
    }
  });

  it("bicubic reproduces a quadratic exactly and bilinear a plane (Keys 1981 §III)", () => {
    const nx = 12;
    const ny = 10;
    const quad = (x: number, y: number): number => 0.3 + 0.2 * x - 0.1 * y + 0.05 * x * x - 0.02 * x * y + 0.03 * y * y;
    const plane = (x: number, y: number): number => 0.3 + 0.2 * x - 0.1 * y;
    const q = new Float64Array(nx * ny);
    const p = new Float64Array(nx * ny);
    for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) {
      q[y * nx + x] = quad(x, y);
      p[y * nx + x] = plane(x, y);
    }
    for (const [x, y] of [[3.3, 4.7], [5.5, 5.5], [7.91, 2.05], [1.01, 7.99]] as const) {
      expect(sampleBicubic(q, nx, ny, x, y)).toAllClose(quad(x, y), { rtol: 1e-13 });
      expect(sampleBilinear(p, nx, ny, x, y)).toAllClose(plane(x, y), { rtol: 1e-13 });
    }
  });

  it("returns NaN outside the outer pixel edges and next to a NaN pixel", () => {
    const d = new Float64Array(16).fill(1);
    expect(sampleBicubic(d, 4, 4, -0.6, 1)).toBeNaN();
    expect(sampleBilinear(d, 4, 4, 1, 3.51)).toBeNaN();
    expect(sampleBicubic(d, 4, 4, -0.4, 3.4)).toAllClose(1, { rtol: 1e-15 });
    d[5] = NaN;
    expect(sampleBicubic(d, 4, 4, 1.5, 1.5)).toBeNaN();
    expect(sampleBilinear(d, 4, 4, 2, 2)).toAllClose(1, { rtol: 0 });
  });
});

describe("reproject", () => {
  const source = mapOf(160, 160, tanWcs(80.5, 0.5, 0), blob(2.5)); // σ = 5 source pixels
  // target: rotated by 30°, shifted by half a pixel, slightly finer pixels
  const target = { nx: 120, ny: 120, wcs: tanWcs(60, 0.45, 30) }; // fits inside the source once rotated
  const truth = mapOf(target.nx, target.ny, target.wcs, blob(2.5));

  // Measured (docs/wcs.md): bicubic 3.1e-4, bilinear 9.1e-3 of the peak; bounds are 1.5× those.
  function maxError(m: SkyMap): number {
    let worst = 0;
    for (const v of m.data) if (Number.isNaN(v)) return NaN;
    for (let k = 0; k < m.data.length; k++) worst = Math.max(worst, Math.abs((m.data[k] as number) - (truth.data[k] as number)));
    return worst;
  }

  it("bicubic (default) resamples a σ = 5 px Gaussian onto a rotated, half-pixel-shifted grid within 5e-4 of the peak", () => {
    const out = reproject(source, target);
    expect(out.unit).toBe("K_CMB");
    expect(maxError(out)).toBeLessThan(5e-4);
  });

  it("bilinear does the same within 1.4e-2, and less accurately than bicubic", () => {
    const lin = reproject(source, target, { method: "bilinear" });
    const cub = reproject(source, target, { method: "bicubic" });
    expect(maxError(lin)).toBeLessThan(1.4e-2);
    expect(maxError(lin)).toBeGreaterThan(2 * maxError(cub));
  });

  it("resamples between projections: CAR source onto a SIN target within 5e-4 of the peak (bicubic)", () => {
    const carWcs = wcsFromHeader(header({ CTYPE1: "RA---CAR", CTYPE2: "DEC--CAR", CRVAL1: 150, CRVAL2: 0, CRPIX1: 80.5, CRPIX2: -160.5, CDELT1: -0.5 / 60, CDELT2: 0.5 / 60 }));
    const car = mapOf(160, 160, carWcs, blob(2.5)); // CRVAL2 = 0 with CRPIX2 offset: rows span Dec ≈ 1.3°…2.7°
    const sinGrid = { nx: 100, ny: 100, wcs: tanWcs(50, 0.5, 15, { CTYPE1: "RA---SIN", CTYPE2: "DEC--SIN" }) };
    const out = reproject(car, sinGrid);
    const exact = mapOf(100, 100, sinGrid.wcs, blob(2.5));
    let worst = 0;
    for (let k = 0; k < out.data.length; k++) worst = Math.max(worst, Math.abs((out.data[k] as number) - (exact.data[k] as number)));
    expect(worst).toBeLessThan(5e-4);
  });

  it("gives back the source on its own grid", () => {
    const out = reproject(source, { nx: source.nx, ny: source.ny, wcs: source.wcs as Wcs });
    expect(out.data).toAllClose(source.data, { atol: 1e-9, rtol: 0 });
    expect(sameGrid(out, source)).toBe(true);
    expect(sameGrid(out, { ...target })).toBe(false);
  });

  it("treats LATPOLE = 90 and the pole latitude it resolves to as the same grid", () => {
    // CAR south of the equator: LONPOLE 180 and LATPOLE 90 select δ_p = 90° + δ0 (C&G 2002 §2.4)
    const written = wcsFromHeader(header({ CTYPE1: "RA---CAR", CTYPE2: "DEC--CAR", CRVAL1: 120, CRVAL2: -5, CRPIX1: 5, CRPIX2: 5, CDELT1: -0.01, CDELT2: 0.01 }));
    expect(written.latpole).toAllClose(85, { rtol: 1e-12 });
    const literal: Wcs = { ...written, latpole: 90 };
    expect(sameGrid({ nx: 9, ny: 9, wcs: written }, { nx: 9, ny: 9, wcs: literal })).toBe(true);
    expect(sameGrid({ nx: 9, ny: 9, wcs: written }, { nx: 9, ny: 9, wcs: { ...written, crval: [120, -5.001] } })).toBe(false);
    expect(sameGrid({ nx: 9, ny: 9, wcs: written }, { nx: 9, ny: 9, wcs: { ...written, crval: [480, -5] } })).toBe(true);
  });

  it("puts NaN where the source does not cover the target", () => {
    const wide = { nx: 300, ny: 300, wcs: tanWcs(150.5, 0.5, 0) };
    const out = reproject(source, wide);
    expect(out.data[0]).toBeNaN();
    expect(out.data[150 * 300 + 150]).not.toBeNaN();
    let nan = 0;
    for (const v of out.data) if (Number.isNaN(v)) nan++;
    expect(nan).toBe(300 * 300 - 160 * 160);
  });

  it("refuses maps in frames it cannot convert (FK4 B1950 onto ICRS needs E-terms)", () => {
    const fk4 = { nx: 10, ny: 10, wcs: tanWcs(5, 0.5, 0, { RADESYS: "FK4", EQUINOX: 1950 }) };
    try {
      reproject(source, fk4);
      expect.unreachable();
    } catch (e) {
      expect(isUmbraError(e, "BAD_WCS")).toBe(true);
    }
  });
});
