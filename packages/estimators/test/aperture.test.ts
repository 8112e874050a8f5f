import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { createRng, RAD_PER_ARCMIN } from "@umbra/core";
import { besselJ0, getRfft2Plan, type FlatGeometry } from "@umbra/maps";
import { apertureSum, apertureVarianceFromPower, apertureVarianceRadial, besselJ1, interpolatePower, pixelAreaArcmin2, randomApertureScatter } from "../src/aperture/index.js";

const geomOf = (n: number, pixArcmin: number): FlatGeometry => ({ nx: n, ny: n, dxRad: pixArcmin * RAD_PER_ARCMIN, dyRad: pixArcmin * RAD_PER_ARCMIN });

function ellOf(geom: FlatGeometry): Float64Array {
  const layout = getRfft2Plan(geom.nx, geom.ny).layout;
  const out = new Float64Array(layout.modeCount);
  for (let k = 0; k < layout.modeCount; k++) {
    out[k] = 2 * Math.PI * Math.hypot((layout.kxIndex[k] as number) / (geom.nx * geom.dxRad), (layout.kyIndex[k] as number) / (geom.ny * geom.dyRad));
  }
  return out;
}

describe("aperture photometry", () => {
  const geom = geomOf(128, 0.5);
  const spec = { radiusArcmin: 6, annulusInnerArcmin: 8, annulusOuterArcmin: 11 };

  it("returns zero on a constant map (the annulus removes the background)", () => {
    const r = apertureSum(new Float64Array(128 * 128).fill(3e-5), geom, 64.3, 60.7, spec);
    expect(r.flags).toEqual([]);
    expect(r.yArcmin2).toAllClose(0, { atol: 1e-15 }); // rounding of a ~3e-3 arcmin² disc sum
    expect(r.background).toAllClose(3e-5, { rtol: 1e-12 });
  });

  it("recovers the integral of a Gaussian blob: Y₀(1 − exp(−R²/2σ²)) (textbook Gaussian integral)", () => {
    const map = new Float64Array(128 * 128);
    const sigmaArcmin = 1.5;
    const y0 = 1e-4;
    const xc = 63.4;
    const yc = 64.2;
    for (let iy = 0; iy < 128; iy++) for (let ix = 0; ix < 128; ix++) {
      const r2 = (((ix - xc) * 0.5) ** 2 + ((iy - yc) * 0.5) ** 2) / sigmaArcmin ** 2;
      map[iy * 128 + ix] = y0 * Math.exp(-0.5 * r2);
    }
    const total = 2 * Math.PI * sigmaArcmin ** 2 * y0; // arcmin²
    const r = apertureSum(map, geom, xc, yc, spec);
    // exact Gaussian: 1 − exp(−(6/1.5)²/2) = 1 − e⁻⁸; the annulus holds < e⁻¹⁴ of it. Pixelised sum of a
    // well-sampled Gaussian (σ = 3 px) agrees with the integral far better than 1e-6 (common practice).
    expect(r.yArcmin2).toAllClose(total * (1 - Math.exp(-8)), { rtol: 2e-3 });
    expect(r.discPixels * pixelAreaArcmin2(geom)).toAllClose(Math.PI * 36, { rtol: 0.02 });
  });

  it("flags apertures that leave the map or hit masked pixels, with NaN values", () => {
    const map = new Float64Array(128 * 128);
    const edge = apertureSum(map, geom, 10, 64, spec);
    expect(edge.flags).toEqual(["edge"]);
    expect(Number.isNaN(edge.yArcmin2)).toBe(true);
    map[64 * 128 + 64] = NaN;
    const masked = apertureSum(map, geom, 64, 64, spec);
    expect(masked.flags).toEqual(["masked"]);
    expect(Number.isNaN(masked.yArcmin2)).toBe(true);
  });
});

describe("aperture errors", () => {
  const geom = geomOf(256, 0.5);
  const spec = { radiusArcmin: 2, annulusInnerArcmin: 3, annulusOuterArcmin: 4 };
  const ell = ellOf(geom);
  const omegaSr = geom.dxRad * geom.dyRad;

  it("analytic variance equals σ²ΔΩ²(N_disc + N_disc²/N_ann) for white noise (Parseval)", () => {
    const sigma = 2e-6;
    const probe = apertureSum(new Float64Array(256 * 256), geom, 128, 128, spec);
    const area = pixelAreaArcmin2(geom);
    const closed = sigma ** 2 * area ** 2 * (probe.discPixels + probe.discPixels ** 2 / probe.annulusPixels);
    const v = apertureVarianceFromPower(geom, spec, () => sigma ** 2 * omegaSr, ell);
    expect(v).toAllClose(closed, { rtol: 1e-10 });
  });

  it("analytic error matches the scatter of random apertures on a correlated noise field", () => {
    // field: white noise smoothed by a Gaussian of σ_s = 1 arcmin, so C(ℓ) = σ²ΔΩ exp(−ℓ²σ_s²) exactly
    const plan = getRfft2Plan(256, 256);
    const rng = createRng(21);
    const sigma = 2e-6;
    const sS = 1 * RAD_PER_ARCMIN;
    const white = new Float64Array(256 * 256);
    rng.fillNormal(white);
    for (let i = 0; i < white.length; i++) white[i] = (white[i] as number) * sigma;
    const spec2 = new Float64Array(plan.layout.spectrumLength);
    plan.forward(white, spec2);
    for (let k = 0; k < plan.layout.modeCount; k++) {
      const b = Math.exp(-0.5 * (ell[k] as number) ** 2 * sS * sS);
      spec2[2 * k] = (spec2[2 * k] as number) * b;
      spec2[2 * k + 1] = (spec2[2 * k + 1] as number) * b;
    }
    const field = new Float64Array(256 * 256);
    plan.inverse(spec2, field);
    const analytic = Math.sqrt(apertureVarianceFromPower(geom, spec, (l) => sigma ** 2 * omegaSr * Math.exp(-l * l * sS * sS), ell));
    const emp = randomApertureScatter(field, geom, spec, createRng(22), { count: 400 });
    expect(emp.count).toBe(400);
    // 400 apertures on a 128′ field overlap partly: the scatter of a std estimate is ≈ 1/sqrt(2·400) ≈ 3.5 %
    // for independent ones; allow 12 %.
    expect(emp.stdArcmin2).toAllClose(analytic, { rtol: 0.12 });
  });

  it("interpolates a binned power spectrum linearly and skips NaN bins", () => {
    const p = interpolatePower({ ellCenters: [100, 200, 300, 400], cl: [1, NaN, 3, 5] });
    expect([p(50), p(100), p(200), p(350), p(1000)]).toAllClose([1, 1, 2, 4, 5], { rtol: 1e-14 });
  });

  it("stays away from avoided positions", () => {
    const map = new Float64Array(256 * 256);
    const r = randomApertureScatter(map, geom, spec, createRng(3), { count: 50, avoid: [{ xPix: 128, yPix: 128 }], avoidRadiusArcmin: 60 });
    expect(r.count).toBe(50);
    expect(r.stdArcmin2).toAllClose(0, { atol: 0 });
  });
});

describe("radial aperture variance", () => {
  it("J1 satisfies ∫₀ˣ t J0(t) dt = x J1(x) (DLMF 10.22.1) against the maps package's J0, and J1(1) from tables", () => {
    // A&S Table 9.1: J1(1) = 0.4400505857 (from memory)
    expect(besselJ1(1)).toAllClose(0.4400505857, { rtol: 1e-9 });
    for (const x of [0.5, 3, 10, 40, 120]) {
      // composite Simpson on [0, x] with 4000 panels (error ≪ 1e-9 for these smooth integrands)
      const n = 4000;
      const h = x / n;
      let s = 0;
      for (let i = 0; i <= n; i++) {
        const t = i * h;
        const w = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
        s += w * t * besselJ0(t);
      }
      expect((s * h) / 3).toAllClose(x * besselJ1(x), { rtol: 1e-8, atol: 1e-10 });
    }
    expect(besselJ1(-2)).toAllClose(-besselJ1(2), { rtol: 1e-15 });
  });

  it("the continuous-aperture radial integral agrees with the exact sum over the map's modes on a beam-limited spectrum", () => {
    const geom = geomOf(256, 0.5);
    const ell = ellOf(geom);
    const spec = { radiusArcmin: 3, annulusInnerArcmin: 4.5, annulusOuterArcmin: 6 };
    const s = (2 / Math.sqrt(8 * Math.LN2)) * RAD_PER_ARCMIN; // 2′ FWHM beam on a steep + white spectrum
    const power = (l: number) => (1e-16 * (1 + (1000 / Math.max(l, 50)) ** 3)) * Math.exp(-l * l * s * s);
    const exact = apertureVarianceFromPower(geom, spec, power, ell);
    const ellMax = Math.PI * Math.hypot(1 / geom.dxRad, 1 / geom.dyRad);
    const radial = apertureVarianceRadial(spec, power, ellMax, 20);
    // pixel-centre membership vs a continuous disc, and a Riemann sum on a 128′ grid: a few per cent
    expect(radial).toAllClose(exact, { rtol: 0.02 }); // measured 0.75 %
  });
});

describe("aperture photometry is linear", () => {
  it("Y_ap(a·x + b·z) = a·Y_ap(x) + b·Y_ap(z) at any position (property)", () => {
    const geom = geomOf(64, 0.5);
    const rng = createRng(9);
    const x = new Float64Array(64 * 64);
    const z = new Float64Array(64 * 64);
    rng.fillNormal(x);
    rng.fillNormal(z);
    const spec = { radiusArcmin: 3, annulusInnerArcmin: 4, annulusOuterArcmin: 5.5 };
    fc.assert(
      fc.property(fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: 12, max: 51, noNaN: true }), fc.double({ min: 12, max: 51, noNaN: true }), (a, b, px, py) => {
        const mix = x.map((v, i) => a * v + b * (z[i] as number));
        const lhs = apertureSum(mix, geom, px, py, spec).yArcmin2;
        const rhs = a * apertureSum(x, geom, px, py, spec).yArcmin2 + b * apertureSum(z, geom, px, py, spec).yArcmin2;
        expect(lhs).toAllClose(rhs, { rtol: 1e-10, atol: 1e-12 });
      }),
      { numRuns: 100, seed: 4 },
    );
  });
});
