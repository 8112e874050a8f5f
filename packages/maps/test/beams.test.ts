import { readFileSync } from "node:fs";
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import {
  beamForBand,
  besselJ0,
  equivalentFwhmArcmin,
  gaussianBeam,
  loadBeamFile,
  parseNumericTable,
  profileBeam,
  readNumericTable,
  readTransferFits,
  transferBeam,
} from "../src/beams/index.js";

const fixture = (name: string): string => fileURLToPath(new URL(`../../../fixtures/beams/${name}`, import.meta.url));
// scipy.special.j0 and scipy.integrate.quad values from fixtures/beams/make_reference.py (versions in the JSON)
const ref = JSON.parse(readFileSync(fixture("reference.json"), "utf8")) as {
  library: Record<string, string>;
  j0: { x: number[]; value: number[] };
  profile_transform: { ell: number[]; b_ell: number[]; solid_angle_sr: number };
};
const ARCMIN = Math.PI / 180 / 60;
const sigmaOf = (fwhmArcmin: number): number => (fwhmArcmin / Math.sqrt(8 * Math.LN2)) * ARCMIN;

let dir = "";
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "umbra-beams-"));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe("besselJ0", () => {
  it("matches scipy.special.j0 to 1e-15 on both sides of the series/asymptotic switch at 25", () => {
    expect(ref.library.scipy).toMatch(/^\d/);
    const got = ref.j0.x.map(besselJ0);
    expect(got).toAllClose(ref.j0.value, { atol: 1e-15, rtol: 0 });
  });
});

describe("gaussianBeam (common practice, no source)", () => {
  const b = gaussianBeam(1.4);
  const sigma = sigmaOf(1.4);

  it("has solid angle π FWHM²/(4 ln 2) and is half power at FWHM/2", () => {
    expect(b.solidAngleSr).toAllClose((Math.PI * (1.4 * ARCMIN) ** 2) / (4 * Math.LN2), { rtol: 1e-14 });
    expect(b.profileAtThetaRad(0.7 * ARCMIN)).toAllClose(0.5, { rtol: 1e-14 });
    expect(equivalentFwhmArcmin(b)).toAllClose(1.4, { rtol: 1e-14 });
  });

  it("has B_ell = exp(−ell(ell+1)σ²/2) in scalar and array form", () => {
    const ells = Float64Array.from([0, 1, 100, 3000, 12000]);
    const expected = Array.from(ells, (l) => Math.exp((-l * (l + 1) * sigma * sigma) / 2));
    expect(b.transferOnEll(ells)).toAllClose(expected, { rtol: 1e-14 });
    expect(Array.from(ells, b.transferAtEll)).toAllClose(expected, { rtol: 1e-14 });
    expect(b.transferAtEll(0)).toBe(1);
  });

  it("rejects a non-positive FWHM with BAD_VALUE", () => {
    expect(() => gaussianBeam(0)).toThrow(/must be a positive number/);
    expect(() => gaussianBeam(Number.NaN)).toThrow(/must be a positive number/);
  });
});

describe("profileBeam (tabulated radial profile → B_ell by Hankel transform)", () => {
  it("reproduces the closed-form Gaussian B_ell to 1e-7 and its solid angle to 1e-8 (DLMF 10.22.51)", () => {
    const sigma = sigmaOf(5);
    const n = 301; // 0 … 30 arcmin in 0.1 arcmin steps
    const theta = Float64Array.from({ length: n }, (_, i) => i * 0.1 * ARCMIN);
    const value = Float64Array.from(theta, (t) => 3.7 * Math.exp(-(t * t) / (2 * sigma * sigma))); // any scale
    const beam = profileBeam(theta, value);
    const g = gaussianBeam(5);
    const ells = Float64Array.from({ length: 400 }, (_, i) => i * 20.3); // up to ell·σ ≈ 5
    expect(beam.transferOnEll(ells)).toAllClose(g.transferOnEll(ells), { atol: 1e-7, rtol: 0 });
    expect(beam.solidAngleSr).toAllClose(g.solidAngleSr, { rtol: 1e-8 });
    expect(beam.transferAtEll(0)).toBe(1);
    expect(beam.profileAtThetaRad(2.5 * ARCMIN)).toAllClose(0.5, { rtol: 1e-6 });
    expect(beam.profileAtThetaRad(31 * ARCMIN)).toBe(0);
    expect(beam.transferAtEll(beam.ellMax * 1.01)).toBe(0);
  });

  it("matches scipy quadrature of a non-Gaussian profile (core + wing + shoulder) to 1e-7", async () => {
    const beam = await loadBeamFile(fixture("profile_invented.txt"));
    expect(beam.kind).toBe("profile");
    expect(ref.profile_transform.ell.map((l) => beam.transferAtEll(l))).toAllClose(ref.profile_transform.b_ell, { atol: 1e-7, rtol: 0 });
    expect(beam.solidAngleSr).toAllClose(ref.profile_transform.solid_angle_sr, { rtol: 1e-7 });
  });

  it("rejects a table that does not start at θ = 0 or has a non-positive centre value", () => {
    const t = Float64Array.from([0.1, 0.2, 0.3, 0.4, 0.5]);
    expect(() => profileBeam(t, Float64Array.from([1, 0.8, 0.5, 0.2, 0.1]))).toThrow(/start at θ = 0/);
    const t0 = Float64Array.from([0, 0.2, 0.3, 0.4, 0.5]);
    expect(() => profileBeam(t0, Float64Array.from([0, 0.8, 0.5, 0.2, 0.1]))).toThrow(/must be > 0/);
  });
});

describe("transferBeam (tabulated B_ell → profile by inverse Hankel transform)", () => {
  const g = gaussianBeam(10);

  for (const name of ["bell_gauss_fwhm10.fits", "bell_gauss_fwhm10_rowindex.fits"]) {
    it(`${name}: solid angle 2πσ² to 1e-9 and Gaussian profile to 1e-8`, async () => {
      const beam = await loadBeamFile(fixture(name));
      expect(beam.kind).toBe("transfer");
      expect(beam.ellMax).toBe(6000);
      expect(beam.solidAngleSr).toAllClose(g.solidAngleSr, { rtol: 1e-9 });
      const thetas = Array.from({ length: 40 }, (_, i) => i * 0.6 * ARCMIN);
      expect(thetas.map(beam.profileAtThetaRad)).toAllClose(thetas.map(g.profileAtThetaRad), { atol: 1e-8, rtol: 0 });
      const ells = Float64Array.from({ length: 300 }, (_, i) => i * 19.7);
      expect(beam.transferOnEll(ells)).toAllClose(g.transferOnEll(ells), { atol: 1e-6, rtol: 0 });
      expect(beam.transferAtEll(6001)).toBe(0);
    });
  }

  it("reads the ELL column when present and the row index otherwise", async () => {
    const a = await readTransferFits(fixture("bell_gauss_fwhm10.fits"));
    expect([a.ell[0], a.ell[1], a.ell.length]).toEqual([0, 4, 1501]);
    const b = await readTransferFits(fixture("bell_gauss_fwhm10_rowindex.fits"));
    expect([b.ell[0], b.ell[1], b.ell.length]).toEqual([0, 1, 6001]);
    expect(b.bell[4]).toAllClose(a.bell[1] as number, { rtol: 1e-7 }); // float32 column
  });

  it("reads a text B_ell table recognised by its column comment", async () => {
    const sigma = sigmaOf(3);
    const lines = ["# ell B_ell", ...Array.from({ length: 20001 }, (_, l) => `${l} ${Math.exp((-l * (l + 1) * sigma * sigma) / 2)}`)];
    const path = join(dir, "bell.txt");
    await writeFile(path, lines.join("\n"));
    const beam = await loadBeamFile(path);
    expect(beam.kind).toBe("transfer");
    expect(beam.solidAngleSr).toAllClose(gaussianBeam(3).solidAngleSr, { rtol: 1e-9 });
    expect(() => transferBeam(Float64Array.from([1, 2, 3, 4]), Float64Array.from([1, 1, 1, 1]))).toThrow(/start at ell = 0/);
  });
});

describe("readNumericTable and beam loading errors", () => {
  it("skips comments and blank lines, accepts commas, keeps the first n columns", () => {
    const [a, b] = parseNumericTable("# header\n\n0 1 9\n0.5,0.8 # trailing\n  1\t0.25\n", 2);
    expect(Array.from(a as Float64Array)).toEqual([0, 0.5, 1]);
    expect(Array.from(b as Float64Array)).toEqual([1, 0.8, 0.25]);
  });

  it("names the file and line of a bad line", async () => {
    const path = join(dir, "bad.txt");
    await writeFile(path, "# theta_arcmin value\n0 1\n0.1 x\n");
    try {
      await readNumericTable(path, 2);
      expect.unreachable();
    } catch (e) {
      expect(isUmbraError(e, "BAD_DATA")).toBe(true);
      if (isUmbraError(e)) expect(e.place).toMatchObject({ file: path, row: 3 });
    }
    expect(() => parseNumericTable("1\n", 2, "t.txt")).toThrow(/t.txt, row 1: expected 2 numbers/);
    await expect(readNumericTable(join(dir, "none.txt"), 2)).rejects.toMatchObject({ code: "NOT_FOUND" });
  });

  it("asks for the kind when a text beam file does not name its columns", async () => {
    const path = join(dir, "anon.txt");
    await writeFile(path, "0 1\n1 0.5\n2 0.1\n3 0\n");
    await expect(loadBeamFile(path)).rejects.toThrow(/cannot tell a profile from a B_ell table/);
  });

  it("builds a band's beam from its FWHM when it has no beam file", async () => {
    const b = await beamForBand({ name: "f150", beamPath: null, beamFwhmArcmin: 1.4 });
    expect(b.kind).toBe("gaussian");
    await expect(beamForBand({ name: "f150", beamPath: null, beamFwhmArcmin: null })).rejects.toMatchObject({ code: "BAD_MANIFEST" });
  });
});
