import { describe, expect, it } from "vitest";
import { buildFilterBank } from "../src/mmf/bank.js";
import { filterRadialProfile } from "../src/mmf/filterProfile.js";
import { gaussianShape, profileAt, tabulateProfile } from "../src/mmf/profile.js";
import { RAD_PER_ARCMIN, gaussianBeam, setup, whiteCovariance } from "./mmf-helpers.js";

describe("filterRadialProfile", () => {
  const s = setup(128, 0.5);
  const sigC = 2 * RAD_PER_ARCMIN;
  const table = tabulateProfile(gaussianShape(1), 200000 * sigC);

  it("is the beam-convolved template B(ℓ)τ̃(ℓ) for one band in white noise (matched filter = template; common practice)", () => {
    const beam = gaussianBeam(2.0);
    const bank = buildFilterBank({
      layout: s.layout, geometry: s.geom, ells: s.ells,
      spectra: [new Float64Array(s.layout.spectrumLength)],
      beams: [beam],
      covariance: whiteCovariance([[1e-9]], s.geom, [beam]),
    });
    const p = filterRadialProfile(bank, table, sigC, Float64Array.of(-2.5));
    expect(p.thetaArcmin).toAllClose(2, { rtol: 1e-12 });
    expect(p.ell.length).toBeGreaterThan(20);
    const expected = p.ell.map((l) => beam(Float64Array.of(l))[0]! * profileAt(table, l * sigC));
    const norm = Math.max(...expected.map(Math.abs));
    // the SED is negative, so the normalised weights are the template with a minus sign
    expect(p.weights[0]!).toAllClose(expected.map((v) => -v / norm), { rtol: 1e-6, atol: 1e-9 });
  });

  it("gives a band with ten times the noise σ a hundredth of the weight at the same SED (inverse-variance weighting)", () => {
    const beam = gaussianBeam(2.0);
    const bank = buildFilterBank({
      layout: s.layout, geometry: s.geom, ells: s.ells,
      spectra: [new Float64Array(s.layout.spectrumLength), new Float64Array(s.layout.spectrumLength)],
      beams: [beam, beam],
      covariance: whiteCovariance([[1e-9, 0], [0, 1e-7]], s.geom, [beam, beam]),
    });
    const p = filterRadialProfile(bank, table, sigC, Float64Array.of(1, 1));
    const ratio = p.weights[1]!.map((w, k) => w / p.weights[0]![k]!).filter((r) => Number.isFinite(r));
    expect(ratio).toAllClose(0.01, { rtol: 1e-9 });
  });
});
