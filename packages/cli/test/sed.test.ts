import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { T0_K, componentResponse, dimensionlessFrequency } from "@umbra/spectra";
import { run } from "../src/main.js";
import { captureOutputEachTest } from "./capture.js";

const io = captureOutputEachTest();

const dir = mkdtempSync(join(tmpdir(), "umbra-sed-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface SedJson {
  component: string;
  unit: string;
  te_kev: number | null;
  values: { frequency_ghz: number; response: number; bandpass?: string; effective_frequency_ghz?: number }[];
}

describe("umbra sed", () => {
  it("prints the non-relativistic tSZ per unit y in K_CMB as JSON: T0 (x coth(x/2) − 4) (Birkinshaw 1999, Phys. Rep. 310, 97)", async () => {
    expect(await run(["sed", "--component", "tsz", "--freq", "90,150,220", "--json"])).toBe(0);
    const j = JSON.parse(io.out) as SedJson;
    expect(j.component).toBe("tsz");
    expect(j.unit).toBe("K_CMB");
    expect(j.te_kev).toBe(0);
    expect(j.values.map((v) => v.frequency_ghz)).toEqual([90, 150, 220]);
    const expected = [90, 150, 220].map((f) => {
      const x = dimensionlessFrequency(f);
      return T0_K * (x / Math.tanh(x / 2) - 4);
    });
    expect(j.values.map((v) => v.response)).toAllClose(expected, { rtol: 1e-14 });
  });
  it("uses the relativistic response with --te-kev and the requested unit", async () => {
    expect(await run(["sed", "--component", "tsz", "--freq", "150,353", "--te-kev", "10", "--unit", "uK_CMB", "--json"])).toBe(0);
    const j = JSON.parse(io.out) as SedJson;
    expect(j.te_kev).toBe(10);
    for (const v of j.values) {
      expect(v.response).toAllClose(componentResponse({ kind: "tsz", kTeKeV: 10 }, { frequencyGHz: v.frequency_ghz }, "uK_CMB"), { rtol: 1e-14 });
    }
  });
  it("reads a two-column bandpass file and reports the band's reference and effective frequencies", async () => {
    const file = join(dir, "band.txt");
    writeFileSync(file, "# GHz weight\n130 1\n150, 1\n\n170 1\n");
    expect(await run(["sed", "--component", "radio", "--alpha", "-1", "--ref-ghz", "150", "--bandpass", file, "--unit", "MJy/sr", "--json"])).toBe(0);
    const j = JSON.parse(io.out) as SedJson;
    expect(j.values).toHaveLength(1);
    expect(j.values[0]!.frequency_ghz).toAllClose(150, { rtol: 1e-14 });
    // a ν⁻¹ source reads its reference amplitude in MJy/sr (IRAS convention); ν_eff = ∫dν/∫ν⁻¹dν
    expect(j.values[0]!.response).toAllClose(1, { rtol: 1e-13 });
    expect(j.values[0]!.effective_frequency_ghz!).toAllClose(40 / Math.log(170 / 130), { rtol: 1e-13 });
  });
  it("converts to Jy/beam with the beam solid angle: MJy/sr × 1e6 × Ω (definition of the units)", async () => {
    expect(await run(["sed", "--component", "radio", "--freq", "150", "--ref-ghz", "150", "--unit", "Jy/beam", "--beam-sr", "2e-7", "--json"])).toBe(0);
    expect((JSON.parse(io.out) as SedJson).values[0]!.response).toAllClose(0.2, { rtol: 1e-14 });
  });
  it("prints a readable table without --json", async () => {
    expect(await run(["sed", "--component", "cmb", "--freq", "100,143"])).toBe(0);
    expect(io.out).toMatch(/^# cmb response in K_CMB per K_CMB\nfrequency_GHz\tresponse\n100\.000\t1\.0000000\n143\.000\t1\.0000000\n$/);
  });
  it("rejects unknown components, unknown units, negative frequencies and bad bandpass rows with one line and exit 2", async () => {
    const cases: [string[], RegExp][] = [
      [["sed", "--component", "synchrotron", "--freq", "30"], /unknown component 'synchrotron'/],
      [["sed", "--component", "tsz", "--freq", "30", "--unit", "mK"], /unknown unit 'mK'/],
      [["sed", "--component", "tsz", "--freq", "90,-150"], /--freq -150 GHz must be positive/],
      [["sed", "--component", "tsz", "--freq", "90", "--te-kev", "-3"], /electron temperature -3 keV/],
      [["sed", "--component", "dust", "--freq", "353", "--unit", "Jy/beam"], /--unit Jy\/beam needs --beam-sr/],
      [["sed", "--component", "tsz", "--bandpass", join(dir, "missing.txt")], /missing\.txt: table file not found or unreadable/],
    ];
    const badRows = join(dir, "bad.txt");
    writeFileSync(badRows, "100 1\n110 x\n");
    cases.push([["sed", "--component", "tsz", "--bandpass", badRows], /bad\.txt, row 2: bandpass table: column 2 'x' is not a finite number/]);
    for (const [argv, re] of cases) {
      io.err = "";
      expect(await run(argv)).toBe(2);
      expect(io.err).toMatch(re);
      expect(io.err.trim().split("\n")).toHaveLength(1);
    }
  });
});
