/** Scenario validation: defaults filled in, every problem reported at once with its field. */
import { readFileSync, readdirSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { isUmbraError, type UmbraError } from "@umbra/core";
import { parseScenario } from "../src/scenario/index.js";

const minimal = {
  name: "tiny",
  field: { nx: 64, ny: 64, pixelArcmin: 1 },
  bands: [{ name: "f150", frequencyGHz: 150, beamFwhmArcmin: 1.4, noiseUKArcmin: 10 }],
  sky: { cmb: { spectrum: "lcdm2018" } },
};

function problemsOf(json: unknown): string[] {
  try {
    parseScenario(json, "s.json");
  } catch (e) {
    expect(isUmbraError(e, "BAD_SCENARIO")).toBe(true);
    expect((e as UmbraError).message).toContain("s.json");
    return [...(e as UmbraError).problems];
  }
  return [];
}

describe("parseScenario", () => {
  it("fills in the documented defaults", () => {
    const s = parseScenario(minimal, "s.json");
    expect(s.field.projection).toBe("TAN");
    expect(s.field.centerDeg).toEqual([0, 0]);
    expect(s.bands[0]!.unit).toBe("uK_CMB");
    expect(s.depth).toEqual({ kind: "uniform" });
    expect(s.cosmology).toBe("cmb2018");
  });
  it("reports every problem in one error, each with its field path", () => {
    const bad = {
      ...minimal,
      field: { nx: 8, ny: 64, pixelArcmin: -1 },
      bands: [
        { name: "f150", frequencyGHz: 150, beamFwhmArcmin: 1.4, noiseUKArcmin: 10, colour: "red" },
        { name: "f90", beamFwhmArcmin: 2, noiseUKArcmin: 10 },
      ],
    };
    const p = problemsOf(bad);
    expect(p.some((x) => x.startsWith("field.nx"))).toBe(true);
    expect(p.some((x) => x.startsWith("field.pixelArcmin"))).toBe(true);
    expect(p.some((x) => x.startsWith("bands[0]") && x.includes("colour"))).toBe(true);
    expect(p.some((x) => x.startsWith("bands[1]") && x.includes("exactly one of frequencyGHz or bandpass"))).toBe(true);
  });
  it("catches cross-field problems: duplicate band names, radio flux range, cluster ids", () => {
    const p = problemsOf({
      ...minimal,
      bands: [minimal.bands[0], minimal.bands[0]],
      sky: {
        radio: { refFrequencyGHz: 150, densityPerDeg2: 10, minFluxJy: 0.01, maxFluxJy: 0.001, slope: 2.5 },
        clusters: {
          list: [
            { id: "X", raDeg: 0, decDeg: 0, m500Msun: 3e14, z: 0.3 },
            { id: "X", raDeg: 0.1, decDeg: 0, m500Msun: 3e14, z: 0.3 },
          ],
        },
      },
    });
    expect(p).toContain("bands[1].name: duplicate band name 'f150'");
    expect(p).toContain("sky.radio.maxFluxJy: must exceed minFluxJy");
    expect(p).toContain("sky.clusters.list[1].id: duplicate id 'X'");
  });
  it("rejects an unknown cosmology and a mass function on a preset without sigma8", () => {
    expect(problemsOf({ ...minimal, cosmology: "nonsense" })[0]).toContain("unknown preset 'nonsense'");
    const p = problemsOf({ ...minimal, cosmology: "concordance", sky: { clusters: { massFunction: { mMinMsun: 1e14, mMaxMsun: 1e15, zMin: 0.1, zMax: 1 } } } });
    expect(p[0]).toContain("has no sigma8");
  });
  it("accepts every scenario shipped in fixtures/scenarios", () => {
    const dir = fileURLToPath(new URL("../../../fixtures/scenarios/", import.meta.url));
    const files = readdirSync(dir).filter((f) => f.endsWith(".json"));
    expect(files.length).toBeGreaterThanOrEqual(4);
    for (const f of files) expect(() => parseScenario(JSON.parse(readFileSync(dir + f, "utf8")), f)).not.toThrow();
  });
});
