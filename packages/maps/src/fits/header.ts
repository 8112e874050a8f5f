/**
 * FITS header parsing (FITS 4.0 §3.3.1, §4; IAU FITS Working Group 2016): 2880-byte blocks of
 * 36 80-character cards ending with the END card, with long strings joined from CONTINUE cards
 * (FITS 4.0 §4.2.1.2).
 */
import { UmbraError } from "@umbra/core";
import { parseCard, parseValueField, type FitsCard, type FitsValue } from "./card.js";
import type { ByteSource } from "./source.js";

/** FITS block length in bytes (FITS 4.0 §3.1). */
export const BLOCK_BYTES = 2880;
/** Card length in bytes (FITS 4.0 §4.1.1). */
export const CARD_BYTES = 80;

/** A parsed header: its cards in file order and keyword look-up. */
export interface FitsHeader {
  /** Every card in file order (CONTINUE cards merged into the card they continue; END omitted). */
  readonly cards: readonly FitsCard[];
  /** Value of the first card with this keyword (upper-cased), null for an undefined value, undefined when absent. */
  get(keyword: string): FitsValue | undefined;
  /** The first card with this keyword, if any. */
  card(keyword: string): FitsCard | undefined;
  /** True when a card with this keyword exists. */
  has(keyword: string): boolean;
}

/** Build a {@link FitsHeader} over cards in file order. */
export function makeHeader(cards: readonly FitsCard[]): FitsHeader {
  const index = new Map<string, number>();
  for (let i = 0; i < cards.length; i++) {
    const c = cards[i] as FitsCard;
    if (c.kind !== "commentary" && !index.has(c.keyword)) index.set(c.keyword, i);
  }
  const card = (keyword: string): FitsCard | undefined => {
    const i = index.get(keyword.toUpperCase()) ?? index.get(keyword);
    return i === undefined ? undefined : cards[i];
  };
  return {
    cards,
    get: (keyword) => card(keyword)?.value,
    card,
    has: (keyword) => card(keyword) !== undefined,
  };
}

/** Where a header ends and its data begins. */
export interface ParsedHeader {
  header: FitsHeader;
  /** Byte offset of the header's first card. */
  headerOffset: number;
  /** Byte offset where the data unit starts (the block after END). */
  dataOffset: number;
}

/** Decode bytes as ASCII/Latin-1 text. */
export function ascii(bytes: Uint8Array): string {
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length).toString("latin1");
}

/**
 * Parse the header that starts at byte `offset` (a block boundary) of `source`, one block at a time.
 * Throws BAD_FITS naming the file, HDU and keyword END when the header has no END card before the end
 * of the file (FITS 4.0 §4.4.1) or holds bytes that are not printable ASCII (§4.1.1).
 */
export function parseHeaderAt(source: ByteSource, offset: number, file: string, hdu: number): ParsedHeader {
  const cards: FitsCard[] = [];
  let pos = offset;
  let sawEnd = false;
  let block = "";
  let blockStart = offset;
  while (pos + CARD_BYTES <= source.length) {
    if (pos >= blockStart + block.length) {
      blockStart = pos;
      block = ascii(source.read(pos, BLOCK_BYTES));
    }
    const text = block.slice(pos - blockStart, pos - blockStart + CARD_BYTES);
    pos += CARD_BYTES;
    if (text.startsWith("END") && text.slice(3).trim() === "") {
      sawEnd = true;
      break;
    }
    const cardNo = cards.length + 1;
    if (text.startsWith("CONTINUE") && text.slice(8, 10) !== "= ") {
      const prev = cards[cards.length - 1];
      if (prev !== undefined && prev.kind === "string" && typeof prev.value === "string" && prev.value.endsWith("&")) {
        const more = parseValueField(text.slice(10));
        if (more !== null && more.kind === "string") {
          const joined = prev.value.slice(0, -1) + String(more.value);
          cards[cards.length - 1] = {
            ...prev,
            value: joined.replace(/ +$/, ""),
            comment: more.comment !== "" ? (prev.comment === "" ? more.comment : `${prev.comment} ${more.comment}`) : prev.comment,
          };
          continue;
        }
      }
      cards.push({ keyword: "CONTINUE", value: null, kind: "commentary", valueText: "", comment: text.slice(8).trimEnd(), text });
      continue;
    }
    if (/[^\x20-\x7e]/.test(text)) {
      throw new UmbraError("BAD_FITS", `header card ${cardNo} holds bytes that are not printable ASCII: missing END card, or a corrupt header`, {
        file,
        hdu,
        keyword: "END",
      });
    }
    cards.push(parseCard(text));
  }
  if (!sawEnd) {
    const what = pos === offset ? "file ends where a header should start" : "header has no END card before the end of the file";
    throw new UmbraError("BAD_FITS", `${what} (truncated file?)`, { file, hdu, keyword: "END" });
  }
  const dataOffset = Math.ceil((pos - offset) / BLOCK_BYTES) * BLOCK_BYTES + offset;
  return { header: makeHeader(cards), headerOffset: offset, dataOffset };
}
