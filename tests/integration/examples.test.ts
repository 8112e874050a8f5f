/**
 * Every notebook-style script in docs/examples runs with tsx, exits 0 and prints its results.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { readdirSync } from "node:fs";
import { fileURLToPath } from "node:url";

const dir = fileURLToPath(new URL("../../docs/examples/", import.meta.url));
const examples = readdirSync(dir).filter((f) => f.endsWith(".ts")).sort();

describe("docs/examples", () => {
  it("has the guided examples (README snippet, load maps, measure, y map, regression)", () => {
    expect(examples.length).toBeGreaterThanOrEqual(5);
  });
  it.each(examples)("%s runs with tsx and prints results", (name) => {
    const r = spawnSync(process.execPath, ["--import", "tsx", `${dir}${name}`], { encoding: "utf8", timeout: 240_000 });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.trim().split("\n").length).toBeGreaterThanOrEqual(2);
    expect(r.stdout).not.toMatch(/NaN ± NaN/);
  }, 300_000);
});
