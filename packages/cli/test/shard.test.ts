import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { parseShard, shardRange } from "../src/shard.js";

describe("parseShard", () => {
  it("reads i/N with 1 ≤ i ≤ N", () => {
    expect(parseShard("3/8")).toEqual({ index: 3, count: 8 });
    expect(parseShard(" 1 / 1 ")).toEqual({ index: 1, count: 1 });
  });
  it.each(["0/4", "5/4", "2", "a/b", "2/0", "-1/3"])("rejects %s with a message naming the option", (t) => {
    expect(() => parseShard(t)).toThrow(/--shard/);
  });
});

describe("shardRange", () => {
  it("covers every item exactly once, in order, with block sizes differing by at most one (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 500 }), fc.integer({ min: 1, max: 40 }), (n, count) => {
        let next = 0;
        const sizes: number[] = [];
        for (let i = 1; i <= count; i++) {
          const r = shardRange(n, { index: i, count });
          expect(r.start).toBe(next);
          next = r.end;
          sizes.push(r.end - r.start);
        }
        expect(next).toBe(n);
        expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
      }),
      { seed: 7, numRuns: 200 },
    );
  });
});
