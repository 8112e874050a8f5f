/**
 * The shipped lensed-ΛCDM TT approximation against the published best-fit spectrum (Planck
 * Collaboration 2020, A&A 641, A6; PR3 minimum-theory file). The published file is reference data
 * outside the repository (../shared/data/ from the repository root): the comparison runs when it is
 * present and is skipped, saying so, when it is not.
 */
import { existsSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import { LCDM_TT_MAX_DEVIATION, lcdmTtClK2, lcdmTtDellUK2, parseClTable } from "../src/cmb/index.js";

const sharedFile = fileURLToPath(new URL("../../../../shared/data/cmb_tt_lcdm_bestfit_2018.txt", import.meta.url));
const present = existsSync(sharedFile);
if (!present) console.warn("cmbSpectrum.test: ../shared/data/cmb_tt_lcdm_bestfit_2018.txt not found: skipping the comparison with the published spectrum");

describe("lensed ΛCDM TT approximation", () => {
  it.skipIf(!present)("stays within 2 % (stated: 0.37 %) of the published best-fit D_ell for 30 <= ell <= 2508", () => {
    const rows = parseClTable(readFileSync(sharedFile, "utf8"), "dell_uK2", sharedFile);
    const model: number[] = [];
    const data: number[] = [];
    for (let i = 0; i < rows.ell.length; i++) {
      const l = rows.ell[i]!;
      if (l < 30) continue;
      model.push(lcdmTtDellUK2(l));
      data.push((rows.clK2[i]! * 1e12 * l * (l + 1)) / (2 * Math.PI));
    }
    expect(model.length).toBe(2508 - 30 + 1);
    // the fit's own statement (fixtures/simulate/cmb_fit_summary.json) plus rounding of the knots
    expect(model).toAllClose(data, { rtol: LCDM_TT_MAX_DEVIATION + 1e-4 });
    expect(model).toAllClose(data, { rtol: 0.02 });
  });
  it("has the first acoustic peak near ell = 220 at about 5750 uK^2", () => {
    // Planck Collaboration 2020, A&A 641, A6, Fig. 1 (first peak of D_ell^TT ≈ 5.7e3 µK² at ℓ ≈ 220; read off the figure)
    let best = 0;
    let bestEll = 0;
    for (let l = 100; l < 400; l++) {
      const d = lcdmTtDellUK2(l);
      if (d > best) {
        best = d;
        bestEll = l;
      }
    }
    expect(bestEll).toAllClose(220, { atol: 8 });
    expect(best).toAllClose(5750, { rtol: 0.03 });
  });
  it("converts D_ell to C_ell in K^2 sr as 2π D/(ell(ell+1)) · 1e-12 and is 0 below ell = 2", () => {
    expect(lcdmTtClK2(1000)).toAllClose((2 * Math.PI * lcdmTtDellUK2(1000) * 1e-12) / (1000 * 1001), { rtol: 1e-15 });
    expect(lcdmTtClK2(1)).toBe(0);
    expect(lcdmTtDellUK2(0)).toBe(0);
  });
  it("falls monotonically in the extrapolated damping tail above ell = 2508", () => {
    const d = [2508, 3000, 4000, 5000].map(lcdmTtDellUK2);
    for (let i = 1; i < d.length; i++) expect(d[i]!).toBeLessThan(d[i - 1]!);
  });
});

describe("user C_ell tables", () => {
  it("reads D_ell and C_ell columns, skipping comments and a header", () => {
    const t = parseClTable("# L TT\nL TT\n2 100\n3 200\n", "dell_uK2", "t.txt");
    expect(Array.from(t.ell)).toEqual([2, 3]);
    expect(t.clK2).toAllClose([(2 * Math.PI * 100) / 6 * 1e-12, (2 * Math.PI * 200) / 12 * 1e-12], { rtol: 1e-14 });
    expect(parseClTable("2, 5\n3, 6", "cl_uK2", "t.csv").clK2).toAllClose([5e-12, 6e-12], { rtol: 1e-14 });
  });
  it("reports every bad row at once as BAD_SCENARIO naming the file", () => {
    let err: unknown;
    try {
      parseClTable("2 1\n2 3\n4 -1\n5 x\n", "dell_uK2", "bad.txt");
    } catch (e) {
      err = e;
    }
    expect(isUmbraError(err, "BAD_SCENARIO")).toBe(true);
    const u = err as { problems: string[]; message: string };
    expect(u.problems.length).toBe(3);
    expect(u.message).toContain("bad.txt");
  });
});
