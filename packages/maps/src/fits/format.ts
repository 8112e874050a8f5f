/**
 * Formatting header cards for writing, per FITS 4.0 §4.1–4.2 (IAU FITS Working Group 2016): 80
 * ASCII characters; logical, integer and real values right-justified to column 30 (fixed format,
 * required for the mandatory keywords, §4.2); strings from column 11 in single quotes, quotes doubled,
 * padded to at least 8 characters (§4.2.1.1); strings too long for one card continued on CONTINUE
 * cards (§4.2.1.2); no NaN or infinite values (not representable, §4.2.4).
 */
import { UmbraError } from "@umbra/core";
import { CARD_BYTES } from "./header.js";

/** A value card to write. `real` forces a real-number literal for an integer-valued number. */
export interface ValueCardInput {
  keyword: string;
  value: string | number | boolean | null;
  comment?: string;
  real?: boolean;
}

/** A commentary card (COMMENT, HISTORY or blank keyword); long text spans several cards. */
export interface CommentaryCardInput {
  commentary: "COMMENT" | "HISTORY" | "";
  text: string;
}

/** Any card a caller can ask the writer to add. */
export type CardInput = ValueCardInput | CommentaryCardInput;

const VALUE_COLUMNS = 70; // columns 11–80
const FIXED_WIDTH = 20; // columns 11–30

function fail(message: string, keyword: string, value?: unknown): never {
  throw new UmbraError("BAD_VALUE", message, value === undefined ? { keyword } : { keyword, value });
}

function checkAscii(text: string, keyword: string, what: string): void {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 32 || c > 126) fail(`${what} contains a character outside printable ASCII (code ${c}); FITS 4.0 §4.1.1 allows only 32–126`, keyword);
  }
}

function checkKeyword(keyword: string): void {
  if (!/^[A-Z0-9_-]{1,8}$/.test(keyword)) fail(`keyword '${keyword}' is not 1–8 characters of A–Z, 0–9, '-', '_' (FITS 4.0 §4.1.2.1)`, keyword);
}

/**
 * A finite number as a FITS real literal: the shortest text that reads back to the same double
 * (so values round-trip exactly), upper-case E, a decimal point always present, exponent with at
 * least two digits (astropy's style).
 */
export function formatReal(x: number, keyword = ""): string {
  if (!Number.isFinite(x)) fail(`value ${String(x)} cannot be written: FITS header values must be finite (FITS 4.0 §4.2.4)`, keyword, x);
  let s = Object.is(x, -0) ? "-0.0" : String(x).toUpperCase();
  const e = s.indexOf("E");
  let mant = e < 0 ? s : s.slice(0, e);
  if (!mant.includes(".")) mant += ".0";
  if (e >= 0) {
    const exp = s.slice(e + 1);
    const sign = exp[0] === "-" ? "-" : "+";
    const digits = exp.replace(/^[+-]/, "").padStart(2, "0");
    s = `${mant}E${sign}${digits}`;
  } else s = mant;
  return s;
}

/** A quoted string literal, padded to 8 characters; the null string stays '' (FITS 4.0 §4.2.1.1 tells it from blanks). */
function quote(text: string): string {
  return text === "" ? "''" : `'${text.replace(/'/g, "''").padEnd(8, " ")}'`;
}

function withComment(head: string, comment: string | undefined): string {
  if (comment === undefined || comment === "") return head.padEnd(CARD_BYTES, " ");
  const room = CARD_BYTES - head.length - 3;
  // a comment cut to a few characters says nothing: drop it unless it fits whole or keeps ≥ 10 characters
  if (room < Math.min(comment.length, 10)) return head.padEnd(CARD_BYTES, " ");
  return `${head} / ${comment.slice(0, room)}`.padEnd(CARD_BYTES, " ");
}

/**
 * Split the quote-escaped `escaped` into pieces of at most `width` characters, breaking after a blank
 * where possible and never inside a doubled quote (the word grouping astropy uses for CONTINUE cards).
 */
function splitAtBlanks(escaped: string, width: number): string[] {
  const pieces: string[] = [];
  let start = 0;
  while (start < escaped.length) {
    let end = Math.min(start + width, escaped.length);
    if (end < escaped.length) {
      const blank = escaped.lastIndexOf(" ", end - 1);
      if (blank >= start) end = blank + 1;
      // do not cut a '' pair: count the quotes ending at end-1 from the start of their run
      let q = 0;
      while (end - 1 - q >= start && escaped[end - 1 - q] === "'") q++;
      let run = q;
      while (end - 1 - run >= 0 && escaped[end - 1 - run] === "'") run++;
      if (run % 2 === 1 && end - start > 1) end -= 1;
    }
    pieces.push(escaped.slice(start, end));
    start = end;
  }
  return pieces;
}

/**
 * The 80-character card(s) for one keyword = value: one card, or for a string longer than a card a
 * first card and CONTINUE cards, each piece ending in '&' but the last (FITS 4.0 §4.2.1.2).
 * Throws BAD_VALUE for an invalid keyword, a non-ASCII string or comment, or a non-finite number.
 */
export function formatValueCard(card: ValueCardInput): string[] {
  const { keyword, value, comment } = card;
  checkKeyword(keyword);
  if (comment !== undefined) checkAscii(comment, keyword, "comment");
  const key = `${keyword.padEnd(8, " ")}= `;
  if (value === null) return [withComment(key, comment)];
  if (typeof value === "boolean") return [withComment(key + (value ? "T" : "F").padStart(FIXED_WIDTH, " "), comment)];
  if (typeof value === "number") {
    const text = Number.isInteger(value) && card.real !== true && Math.abs(value) < 1e21 ? value.toFixed(0) : formatReal(value, keyword);
    return [withComment(key + text.padStart(FIXED_WIDTH, " "), comment)];
  }
  checkAscii(value, keyword, "string value");
  const whole = quote(value);
  if (whole.length <= VALUE_COLUMNS) {
    // with a comment the string field is padded to column 30, as astropy does
    const head = key + (comment !== undefined && comment !== "" ? whole.padEnd(FIXED_WIDTH, " ") : whole);
    return [withComment(head, comment)];
  }
  // 67 characters per piece leave room for the quotes and '&' in columns 11–80; a comment goes on
  // its own CONTINUE cards after the value, '&' on all but the last (astropy's layout)
  const hasComment = comment !== undefined && comment !== "";
  const pieces = splitAtBlanks(value.replace(/'/g, "''"), VALUE_COLUMNS - 3);
  const cards = pieces.map((p, i) => {
    const amp = hasComment || i < pieces.length - 1 ? "&" : "";
    return `${i === 0 ? key : "CONTINUE  "}'${p}${amp}'`.padEnd(CARD_BYTES, " ");
  });
  if (hasComment) {
    const parts = splitAtBlanks(comment, CARD_BYTES - 16);
    parts.forEach((part, i) => cards.push(`CONTINUE  '${i < parts.length - 1 ? "&" : ""}' / ${part}`.padEnd(CARD_BYTES, " ")));
  }
  return cards;
}

/** Commentary cards (COMMENT, HISTORY, blank keyword): the text in columns 9–80, split over as many cards as needed. */
export function formatCommentary(card: CommentaryCardInput): string[] {
  checkAscii(card.text, card.commentary || "(blank)", "commentary text");
  const key = card.commentary.padEnd(8, " ");
  const out: string[] = [];
  for (let i = 0; i < Math.max(1, card.text.length); i += CARD_BYTES - 8) out.push((key + card.text.slice(i, i + CARD_BYTES - 8)).padEnd(CARD_BYTES, " "));
  return out;
}

/** The card(s) for any {@link CardInput}. */
export function formatCard(card: CardInput): string[] {
  return "commentary" in card ? formatCommentary(card) : formatValueCard(card);
}
