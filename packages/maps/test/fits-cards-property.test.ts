/**
 * Property tests: every header value our writer formats reads back through our parser as the same
 * value — strings of any printable ASCII (quotes, '&', any length, so CONTINUE cards; trailing blanks
 * are not significant, FITS 4.0 §4.2.1.1), any finite double (shortest round-trip text), integers,
 * logicals — and every card is exactly 80 characters.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { encodeFits, formatValueCard, parseFitsImage } from "../src/fits/index.js";

const printable = fc.string({ unit: fc.constantFrom(..." !\"#$%&'()*+,-./0123456789:;<=>?@ABCXYZ[\\]^_`abcxyz{|}~".split("")), maxLength: 300 });

async function readBack(value: string | number | boolean, comment: string | undefined): Promise<unknown> {
  const card = comment === undefined ? { keyword: "TESTKEY", value } : { keyword: "TESTKEY", value, comment };
  const bytes = encodeFits([{ data: new Float64Array(1), nx: 1, ny: 1, cards: [card] }]);
  return (await parseFitsImage(bytes, "prop.fits")).header.get("TESTKEY");
}

describe("header values round-trip through writer and reader", () => {
  it("strings of printable ASCII, with or without a comment", async () => {
    await fc.assert(
      fc.asyncProperty(printable, fc.option(printable.map((s) => s.slice(0, 120)), { nil: undefined }), async (s, comment) => {
        for (const c of formatValueCard(comment === undefined ? { keyword: "TESTKEY", value: s } : { keyword: "TESTKEY", value: s, comment })) {
          expect(c.length).toBe(80);
        }
        expect(await readBack(s, comment)).toBe(s.replace(/ +$/, ""));
      }),
      { numRuns: 150, seed: 20261201 },
    );
  });

  it("finite doubles come back bit for bit, integers and logicals unchanged", async () => {
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer(), fc.boolean()), async (v) => {
        const back = await readBack(v, "c");
        expect(Object.is(back, v) || (back === 0 && v === 0)).toBe(true);
      }),
      { numRuns: 150, seed: 20261201 },
    );
  });
});
