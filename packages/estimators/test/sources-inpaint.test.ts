import { describe, expect, it } from "vitest";
import { createRng } from "@umbra/core";
import { inpaintHarmonic } from "../src/sources/inpaint.js";
import { detectPointSources } from "../src/sources/detect.js";
import { gaussianBeam, setup, whiteCovariance } from "./mmf-helpers.js";

describe("harmonic inpainting of masked pixels", () => {
  it("restores a linear ramp exactly (a ramp is harmonic: the discrete Laplace equation holds)", () => {
    const nx = 40, ny = 30;
    const map = new Float64Array(nx * ny);
    const bad = new Uint8Array(nx * ny);
    for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) map[y * nx + x] = 0.3 * x - 0.7 * y + 2;
    const truth = Float64Array.from(map);
    for (let y = 10; y < 18; y++) for (let x = 12; x < 25; x++) { bad[y * nx + x] = 1; map[y * nx + x] = 1e6; }
    inpaintHarmonic(map, bad, nx, ny, { tol: 1e-12, maxSweeps: 20000 });
    expect(map).toAllClose(truth, { rtol: 0, atol: 1e-8 });
  });

  it("replaces a masked bright source by its smooth surroundings", () => {
    const nx = 64, ny = 64;
    const map = createRng(2).fillNormal(new Float64Array(nx * ny)) as Float64Array;
    const bad = new Uint8Array(nx * ny);
    for (let y = 28; y < 36; y++) for (let x = 28; x < 36; x++) { map[y * nx + x] = 1000; bad[y * nx + x] = 1; }
    inpaintHarmonic(map, bad, nx, ny);
    let mx = 0;
    for (let p = 0; p < map.length; p++) if (bad[p] === 1) mx = Math.max(mx, Math.abs(map[p]!));
    expect(mx).toBeLessThan(3);
  });
});

describe("point-source detection", () => {
  it("finds a beam-shaped source at its position and nothing else above 5 sigma in white noise", () => {
    const s = setup(128, 0.5);
    const beam = gaussianBeam(1.4);
    const sigPix = 1e-5;
    const map = createRng(8).fillNormal(new Float64Array(128 * 128)) as Float64Array;
    for (let p = 0; p < map.length; p++) map[p] = (map[p] as number) * sigPix;
    const sb = (1.4 / Math.sqrt(8 * Math.LN2)) ** 2;
    for (let y = 0; y < 128; y++) for (let x = 0; x < 128; x++) map[y * 128 + x] += 2e-4 * Math.exp(-(((x - 70) ** 2 + (y - 50) ** 2) * 0.25) / (2 * sb));
    const spec = new Float64Array(s.layout.spectrumLength);
    s.plan.forward(map, spec);
    const cov = whiteCovariance([[sigPix ** 2]], s.geom, [beam], 31000, 20);
    const found = detectPointSources(s.plan, s.ells, spec, beam(s.ells), cov, 0, s.geom.dxRad * s.geom.dyRad, 5, null);
    expect(found.length).toBe(1);
    expect([found[0]!.px, found[0]!.py]).toAllClose([70, 50], { atol: 0.2, rtol: 0 });
  });
});
