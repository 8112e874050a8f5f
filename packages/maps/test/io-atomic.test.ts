/** Atomic writes and provenance fingerprints. */
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import { makeProvenance, sha256File, sha256Hex, stableJson, tempPathFor, writeFileAtomic } from "../src/io/index.js";

const dir = mkdtempSync(join(tmpdir(), "umbra-io-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("writeFileAtomic", () => {
  it("replaces the destination whole and leaves no temporary file", async () => {
    const path = join(dir, "out.json");
    writeFileSync(path, "old");
    await writeFileAtomic(path, '{"new":true}');
    expect(readFileSync(path, "utf8")).toBe('{"new":true}');
    await writeFileAtomic(path, Uint8Array.from([1, 2, 3]));
    expect([...readFileSync(path)]).toEqual([1, 2, 3]);
    expect(readdirSync(dir)).toEqual(["out.json"]);
  });

  it("writes its temporary file beside the destination (same folder, so rename is atomic)", () => {
    const t = tempPathFor(join(dir, "a", "map.fits"));
    expect(t.startsWith(join(dir, "a", ".map.fits."))).toBe(true);
    expect(t).not.toBe(tempPathFor(join(dir, "a", "map.fits")));
  });

  it("keeps the old file and cleans up when the write fails", async () => {
    const path = join(dir, "sub");
    writeFileSync(join(dir, "keep.txt"), "kept");
    const err = await writeFileAtomic(join(path, "x.txt"), "data").catch((e: unknown) => e);
    expect(isUmbraError(err, "NOT_FOUND")).toBe(true);
    expect(readFileSync(join(dir, "keep.txt"), "utf8")).toBe("kept");
    expect(readdirSync(dir).filter((n) => n.endsWith(".tmp"))).toEqual([]);
  });
});

describe("provenance", () => {
  it("SHA-256 matches the FIPS 180-4 test vectors ('abc' and the empty string)", async () => {
    // FIPS 180-4 / NIST CSRC example values for SHA-256
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    expect(sha256Hex("")).toBe("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
    const p = join(dir, "abc.txt");
    writeFileSync(p, "abc");
    expect(await sha256File(p)).toBe(sha256Hex("abc"));
  });

  it("records tool, version, sorted settings and hashed inputs by base name", async () => {
    const p = join(dir, "input.txt");
    writeFileSync(p, "abc");
    const prov = await makeProvenance("umbra", "0.1.0", { b: 1, a: { y: 2, x: 1 } }, [p], { baseNamesOnly: true });
    expect(prov.inputs).toEqual([{ file: "input.txt", sha256: sha256Hex("abc") }]);
    expect(stableJson(prov.settings)).toBe('{"a":{"x":1,"y":2},"b":1}');
    expect(prov.createdUtc).toBeUndefined();
  });

  it("hashing a missing input is NOT_FOUND naming it", async () => {
    const err = await sha256File(join(dir, "missing.fits")).catch((e: unknown) => e);
    expect(isUmbraError(err, "NOT_FOUND")).toBe(true);
    expect((err as Error).message).toMatch(/missing\.fits/);
  });
});
