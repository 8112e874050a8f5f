/**
 * Soak test: 50 simulated fields through forced photometry and the blind search in one process;
 * the heap after a full GC must not grow (a leak of one field's maps or spectra per iteration would
 * add ≥ 0.2 MB each, ≥ 8 MB over the last 40 iterations; the test allows 4 MB).
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";

describe("soak: 50 fields through measure and search", () => {
  it("keeps the heap flat after warm-up (no per-field memory growth)", () => {
    const script = fileURLToPath(new URL("../support/soak-run.ts", import.meta.url));
    const r = spawnSync(process.execPath, ["--expose-gc", "--import", "tsx", script, "50"], { encoding: "utf8", timeout: 600_000, maxBuffer: 16 * 2 ** 20 });
    expect(r.status, r.stderr).toBe(0);
    const samples = JSON.parse(r.stdout.trim().split("\n").pop() as string) as { heapMB: number; rssMB: number; clusters: number }[];
    expect(samples).toHaveLength(50);
    expect(samples.reduce((a, s) => a + s.clusters, 0)).toBeGreaterThan(0);
    // least-squares slope of heap (MB per field) over iterations 10…49
    const xs = samples.slice(10).map((_, i) => i);
    const ys = samples.slice(10).map((s) => s.heapMB);
    const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
    const my = ys.reduce((a, b) => a + b, 0) / ys.length;
    let sxy = 0, sxx = 0;
    xs.forEach((x, i) => { sxy += (x - mx) * ((ys[i] as number) - my); sxx += (x - mx) ** 2; });
    const slopeMBPerField = sxy / sxx;
    expect(slopeMBPerField * 40).toBeLessThan(4);
    expect(Math.max(...ys) - Math.min(...ys)).toBeLessThan(16);
  }, 600_000);
});
