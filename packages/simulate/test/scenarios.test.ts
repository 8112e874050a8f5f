/**
 * The shipped scenarios simulate end to end, and the hot-cluster scenario's relativistic spectrum
 * is the one @umbra/spectra computes for each cluster's temperature.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { componentResponse } from "@umbra/spectra";
import { parseScenario, simulateField, type Scenario } from "../src/index.js";

function load(name: string): Scenario {
  const path = fileURLToPath(new URL(`../../../fixtures/scenarios/${name}.json`, import.meta.url));
  return parseScenario(JSON.parse(readFileSync(path, "utf8")), path);
}

describe("shipped scenarios", () => {
  it.each(["deep-small-field", "hot-cluster-sample", "ksz-sample"])("%s simulates with finite maps and its clusters in the field", (name) => {
    const s = load(name);
    const f = simulateField(s, 1);
    expect(f.bands.length).toBe(s.bands.length);
    for (const b of f.bands) expect(b.map.every(Number.isFinite)).toBe(true);
    expect(f.clusters.length).toBeGreaterThan(0);
    expect(f.clusters.every((c) => c.inField)).toBe(true);
  });
  it("gives the kSZ sample's listed velocities and draws the others with σ_v = 300 km/s", () => {
    const f = simulateField(load("ksz-sample"), 2);
    expect(f.clusters.slice(0, 4).map((c) => c.vLosKmS)).toEqual([800, -600, 400, -1000]);
    for (const c of f.clusters.slice(4)) expect(Math.abs(c.vLosKmS)).toBeLessThan(5 * 300);
    expect(f.clusters.slice(4).some((c) => c.vLosKmS !== 0)).toBe(true);
  });
});

describe("relativistic tSZ", () => {
  it("paints each hot cluster with its own kTe: the 350 GHz/150 GHz signal ratio follows the relativistic spectrum", () => {
    const base = load("hot-cluster-sample");
    const one = { ...base.sky.clusters!, list: [base.sky.clusters!.list![2]!] }; // EMB-H03, kTe = 15 keV
    const noiseless = base.bands.map((b) => ({ ...b, noiseUKArcmin: 0 }));
    const sum = (rel: boolean): number[] => {
      const s: Scenario = { ...base, bands: noiseless, sky: { clusters: { ...one, relativistic: rel } } };
      return simulateField(s, 3).bands.map((b) => b.map.reduce((a, x) => a + x, 0));
    };
    const r = sum(true);
    const n = sum(false);
    const rel = (f: number): number => componentResponse({ kind: "tsz", kTeKeV: 15 }, { frequencyGHz: f }, "uK_CMB");
    const non = (f: number): number => componentResponse({ kind: "tsz" }, { frequencyGHz: f }, "uK_CMB");
    // band order f090, f150, f220, f350
    expect(r[3]! / r[1]!).toAllClose(rel(350) / rel(150), { rtol: 1e-9 });
    expect(n[3]! / n[1]!).toAllClose(non(350) / non(150), { rtol: 1e-9 });
    // at 15 keV the decrement at 150 GHz is reduced (e.g. Itoh et al. 1998, ApJ 502, 7: a few per cent per 5 keV)
    expect(r[1]! / n[1]!).toBeGreaterThan(0.85);
    expect(r[1]! / n[1]!).toBeLessThan(0.97);
  });
});
