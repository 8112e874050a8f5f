import { describe, expect, it } from "vitest";
import { encodeFits, parseFitsImage, provenanceCards } from "../src/index.js";

describe("provenance cards with non-ASCII settings", () => {
  it("escape characters outside printable ASCII so the header stays legal (FITS 4.0 §4.2.1) and the JSON reads back unchanged", async () => {
    const settings = { sizes: "15 sizes, 0.5–10 arcmin", beam: "θ500" };
    const cards = provenanceCards({ tool: "umbra", version: "0.1.0", settings, inputs: [{ file: "f150–deep.fits", sha256: "0".repeat(64) }] });
    const sets = cards.find((c) => "keyword" in c && c.keyword === "PROVSETS") as { value: string };
    expect(/^[\x20-\x7e]*$/.test(sets.value)).toBe(true);
    expect(JSON.parse(sets.value)).toEqual(settings);
    const bytes = encodeFits([{ data: new Float64Array(4), nx: 2, ny: 2, bitpix: -32 }], { provenance: { tool: "umbra", version: "0.1.0", settings, inputs: [] } });
    const img = await parseFitsImage(bytes, "memory.fits", {});
    expect(JSON.parse(String(img.header.get("PROVSETS")))).toEqual(settings);
  });
});
