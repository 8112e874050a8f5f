/**
 * The matched-filter fit through rings of equal ℓ (src/mmf/fit.ts): the rings partition the modes,
 * the ring form of the sums equals a direct sum over every mode (the filter's formula, written out in
 * this test), a position's rings serve every size bit for bit, and the fit runner's ring sets and
 * grouped batches give the numbers of single fits. Invented fields only.
 */
import { describe, expect, it } from "vitest";
import { Matrix, inverse } from "ml-matrix";
import { ellOfModes, shiftPhases } from "@umbra/maps";
import { buildFilterBank, type FilterBank } from "../src/mmf/bank.js";
import { combineSeds, createFitScratch, ellRings, fitAtPosition, fitFromRings, positionRings, sedNodeTable } from "../src/mmf/fit.js";
import { gaussianShape, profileAt, tabulateProfile, type ProfileTable } from "../src/mmf/profile.js";
import { createFitPool, serialFits } from "../src/parallel/fitPool.js";
import { RAD_PER_ARCMIN, gaussianBeam, paintTemplate, setup, whiteCovariance } from "./mmf-helpers.js";

/**
 * The fit as one sum over every stored mode, as docs/matched-filter.md writes it (no rings, no
 * combined spectra): b_c = Σ_k w_k τ̃ Σ_j A_jc Re[E_j e^{+2πik·x0}] / (N Ω), Φ = Σ_k w_k τ̃² q_cc'(ℓ) / (N Ω²).
 */
function directFit(bank: FilterBank, table: ProfileTable, theta: number, seds: readonly Float64Array[], px: number, py: number): { amplitudes: number[]; covariance: number[] } {
  const { nx, ny } = bank.geometry;
  const nc = seds.length;
  const ex = shiftPhases(nx, px, 1, "half", new Float64Array(2 * nx));
  const ey = shiftPhases(ny, py, 1, "full", new Float64Array(2 * ny));
  const node = sedNodeTable(bank, seds);
  const b = new Array<number>(nc).fill(0);
  const F = new Array<number>(nc * nc).fill(0);
  const { kxIndex, kyIndex, hermitianWeight, modeCount } = bank.layout;
  for (let m = 0; m < modeCount; m++) {
    const g = profileAt(table, bank.ells[m]! * theta) * theta * theta;
    const kx = kxIndex[m]!;
    const ky = kyIndex[m]! < 0 ? kyIndex[m]! + ny : kyIndex[m]!;
    const pr = ex[2 * kx]! * ey[2 * ky]! - ex[2 * kx + 1]! * ey[2 * ky + 1]!;
    const pi = ex[2 * kx]! * ey[2 * ky + 1]! + ex[2 * kx + 1]! * ey[2 * ky]!;
    const w = hermitianWeight[m]! * g;
    for (let c = 0; c < nc; c++) {
      for (let j = 0; j < bank.nBands; j++) {
        const e = bank.whitened[j]!;
        b[c]! += w * seds[c]![j]! * (e[2 * m]! * pr - e[2 * m + 1]! * pi);
      }
    }
    const i = bank.grid.index[m]!;
    const t = bank.grid.frac[m]!;
    for (let q = 0; q < nc * nc; q++) F[q]! += w * g * (node[i * nc * nc + q]! * (1 - t) + node[(i + 1) * nc * nc + q]! * t);
  }
  const norm = 1 / (bank.nPix * bank.pixelSr);
  const fisher = new Matrix(nc, nc);
  for (let c = 0; c < nc; c++) for (let d = 0; d < nc; d++) fisher.set(c, d, (F[c * nc + d]! * norm) / bank.pixelSr);
  const cov = inverse(fisher);
  const amplitudes = Array.from({ length: nc }, (_, c) => Array.from({ length: nc }, (_, d) => cov.get(c, d) * b[d]! * norm).reduce((x, y) => x + y, 0));
  return { amplitudes, covariance: cov.to1DArray() };
}

describe("fits through rings of equal ℓ", () => {
  const s = setup(96, 0.5);
  const sigC = 1.5 * RAD_PER_ARCMIN;
  const table = tabulateProfile(gaussianShape(1), 200000 * 4 * sigC);
  const beams = [gaussianBeam(2.0), gaussianBeam(1.4), gaussianBeam(1.0)];
  const tsz = Float64Array.of(-4.1, -1.2, 3.3);
  const ksz = Float64Array.of(2.7, 2.7, 2.7);
  const spectra = [0, 1, 2].map(() => new Float64Array(s.layout.spectrumLength));
  paintTemplate(s, spectra, table, sigC, [...tsz], beams, 1.2e-4, 40.3, 51.7);
  paintTemplate(s, spectra, table, 2 * sigC, [...tsz], beams, 0.6e-4, 70, 20);
  const cov = whiteCovariance([[4, 1, 0.5], [1, 3, 1], [0.5, 1, 2]].map((r) => r.map((v) => v * 1e-10)), s.geom, beams);
  const bank = buildFilterBank({ layout: s.layout, geometry: s.geom, ells: s.ells, spectra, beams, covariance: cov });

  it("partitions the modes into rings of bitwise-equal ℓ, in increasing ℓ, with the summed Hermitian weights", () => {
    const r = ellRings(bank);
    const weight = new Float64Array(r.ell.length);
    for (let m = 0; m < bank.layout.modeCount; m++) {
      expect(bank.ells[m]).toBe(r.ell[r.ringOf[m]!]);
      weight[r.ringOf[m]!]! += bank.layout.hermitianWeight[m]!;
    }
    for (let u = 1; u < r.ell.length; u++) expect(r.ell[u]!).toBeGreaterThan(r.ell[u - 1]!);
    expect(Array.from(r.weight)).toEqual(Array.from(weight));
    // a square grid of square pixels: ℓ depends on kx² + ky² only (8-fold symmetry), so far fewer rings than modes
    expect(r.ell.length).toBeLessThan(bank.layout.modeCount / 4);
    // rectangular pixels: only ±ky coincide
    const rect = setup(32, 0.5);
    const stretched = { ...rect.geom, dyRad: rect.geom.dyRad * 1.37 };
    const re = ellRings({ ells: ellOfModes(rect.layout, stretched), layout: rect.layout });
    expect(re.ell.length).toBeGreaterThan(rect.layout.modeCount / 2 - 40);
  });

  it("equals the direct sum over every mode, one component and two, at several sizes (relative 1e-12, or 1e-12 σ)", () => {
    // the filter's formula (docs/matched-filter.md; Melin, Bartlett & Delabrouille 2006, A&A 459, 341, eqs. 4–6)
    for (const seds of [[tsz], [tsz, ksz]]) {
      for (const theta of [0.7 * sigC, sigC, 2.3 * sigC]) {
        const ring = fitAtPosition(bank, table, theta, seds, 40.3, 51.7);
        const direct = directFit(bank, table, theta, seds, 40.3, 51.7);
        // an amplitude near zero (the kSZ, none injected) is a difference of large sums: compare it
        // against its own error bar, 1e-12 σ
        const sigma = Math.sqrt(Math.max(...seds.map((_, c) => direct.covariance[c * seds.length + c]!)));
        expect(ring.amplitudes).toAllClose(direct.amplitudes, { rtol: 1e-12, atol: 1e-12 * sigma });
        expect(ring.covariance).toAllClose(direct.covariance, { rtol: 1e-12, atol: 0 });
      }
    }
    // and it recovers the injected amplitude (the template was painted with the same table)
    expect(fitAtPosition(bank, table, sigC, [tsz], 40.3, 51.7).amplitudes[0]).toAllClose(1.2e-4, { rtol: 1e-4 });
  });

  it("serves every size from one position's rings, bit for bit, with and without combined spectra", () => {
    const seds = [tsz];
    const combined = combineSeds(bank, seds);
    const node = sedNodeTable(bank, seds);
    const rings = positionRings(bank, combined, 70, 20);
    const ringsBands = positionRings(bank, bank.whitened, 70, 20);
    for (const theta of [0.5, 1, 1.5, 2, 3].map((k) => k * sigC)) {
      expect(fitFromRings(bank, table, theta, seds, rings, node, combined)).toEqual(fitAtPosition(bank, table, theta, seds, 70, 20, createFitScratch(bank), node, combined));
      expect(fitFromRings(bank, table, theta, seds, ringsBands)).toEqual(fitAtPosition(bank, table, theta, seds, 70, 20));
    }
    // the best size of the scan is the injected one
    const snr = [1, 1.5, 2, 2.5, 3].map((k) => {
      const f = fitFromRings(bank, table, k * sigC, seds, rings, node, combined);
      return f.amplitudes[0]! / Math.sqrt(f.covariance[0]!);
    });
    expect(snr.indexOf(Math.max(...snr))).toBe(2);
  });

  it("gives the runner's ring sets and grouped batches the numbers of single fits, on one thread and on two", async () => {
    const pool = createFitPool(2, { callerTakesTasks: false });
    try {
      await pool.whenReady();
      const positions = [
        { seds: [tsz], sedKey: "tsz", px: 40.3, py: 51.7 },
        { seds: [tsz, ksz], sedKey: "tsz+ksz", px: 70, py: 20 },
        { seds: [tsz], sedKey: "tsz", px: 12.5, py: 80.25 },
      ];
      const thetas = [0.8 * sigC, 1.9 * sigC];
      // requests of one position at several sizes, interleaved with the others (grouping must not depend on order)
      const requests = thetas.flatMap((thetaRad) => positions.map((p) => ({ ...p, thetaRad })));
      const single = requests.map((r) => fitAtPosition(bank, table, r.thetaRad, r.seds, r.px, r.py, createFitScratch(bank), sedNodeTable(bank, r.seds), combineSeds(bank, r.seds)));
      expect(serialFits.fitMany(bank, table, requests)).toEqual(single);
      expect(pool.fitMany(bank, table, requests)).toEqual(single);
      for (const runner of [serialFits, pool]) {
        const rings = runner.ringSet(bank, table, positions);
        expect(rings.count).toBe(positions.length);
        requests.forEach((r, i) => expect(rings.fit(i % positions.length, r.thetaRad)).toEqual(single[i]));
        expect(rings.fitMany(requests.map((r, i) => ({ index: i % positions.length, thetaRad: r.thetaRad })))).toEqual(single);
      }
      expect(pool.workerTasks).toBeGreaterThan(0);
    } finally {
      await pool.close();
    }
  }, 60_000);
});
