/**
 * One FITS header card (an 80-character "keyword record", FITS 4.0 §4.1–4.2; IAU FITS Working
 * Group 2016): keyword, value and comment parsed from its text.
 */

/** A parsed header value: string, logical, integer or real number, or null for an undefined value. */
export type FitsValue = string | number | boolean | null;

/** What kind of value a card holds (FITS 4.0 §4.2). */
export type FitsValueKind = "string" | "logical" | "integer" | "real" | "complex" | "undefined" | "commentary" | "invalid";

/** One parsed header card. */
export interface FitsCard {
  /** Keyword (columns 1–8, trailing blanks removed; the long name for HIERARCH cards). */
  keyword: string;
  /**
   * Parsed value; null for an undefined value, a complex value, and commentary cards. A value that
   * cannot be parsed (kind "invalid") is its raw text, so a consumer expecting a number or logical
   * still fails loudly on it while the rest of the header stays usable.
   */
  value: FitsValue;
  kind: FitsValueKind;
  /** The value as written (e.g. an integer's digits, needed for exact 64-bit BLANK), or "" when none. */
  valueText: string;
  /** Comment after the value's "/", or the text of a commentary card (COMMENT, HISTORY, blank keyword). */
  comment: string;
  /** The card's 80 characters as read (the first card's text for a CONTINUE'd string). */
  text: string;
}

const INT_RE = /^[+-]?[0-9]+$/;
const REAL_RE = /^[+-]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[EeDd][+-]?[0-9]+)?$/;
const COMPLEX_RE = /^\(\s*[^,()]+,\s*[^,()]+\)$/;

/**
 * Parse the value-and-comment field of a card (the text after "= "), per FITS 4.0 §4.2: a string in
 * single quotes with '' as an escaped quote (trailing blanks insignificant, leading ones kept), a
 * logical T/F, an integer, a real with E or D exponent, a complex "(re, im)" (kept as text, value
 * null), or an empty field (undefined value). Returns null when the field cannot be parsed.
 */
export function parseValueField(field: string): { value: FitsValue; kind: FitsValueKind; valueText: string; comment: string } | null {
  let i = 0;
  const n = field.length;
  while (i < n && field.charCodeAt(i) === 32) i++;
  if (i === n) return { value: null, kind: "undefined", valueText: "", comment: "" };
  if (field[i] === "'") {
    let s = "";
    let j = i + 1;
    for (;;) {
      if (j >= n) return null; // unterminated string
      const c = field[j];
      if (c === "'") {
        if (field[j + 1] === "'") {
          s += "'";
          j += 2;
          continue;
        }
        break;
      }
      s += c;
      j++;
    }
    const rest = field.slice(j + 1);
    const comment = commentOf(rest);
    if (comment === null) return null;
    const value = s.replace(/ +$/, "");
    return { value, kind: "string", valueText: field.slice(i, j + 1), comment };
  }
  if (field[i] === "/") return { value: null, kind: "undefined", valueText: "", comment: field.slice(i + 1).trim() };
  const slash = field.indexOf("/", i);
  const token = (slash < 0 ? field.slice(i) : field.slice(i, slash)).trim();
  const comment = slash < 0 ? "" : field.slice(slash + 1).trim();
  if (token === "T" || token === "F") return { value: token === "T", kind: "logical", valueText: token, comment };
  if (INT_RE.test(token)) return { value: Number(token), kind: "integer", valueText: token, comment };
  if (REAL_RE.test(token)) return { value: Number(token.replace(/[Dd]/, "E")), kind: "real", valueText: token, comment };
  if (COMPLEX_RE.test(token)) return { value: null, kind: "complex", valueText: token, comment };
  return null;
}

function commentOf(rest: string): string | null {
  const t = rest.trim();
  if (t === "") return "";
  if (t[0] !== "/") return null; // junk after a closing quote
  return t.slice(1).trim();
}

/** Keyword characters allowed by FITS 4.0 §4.1.2.1: upper-case letters, digits, hyphen, underscore. */
export function isValidKeyword(keyword: string): boolean {
  return /^[A-Z0-9_-]{0,8}$/.test(keyword);
}

/**
 * Parse one 80-character card. Value cards have "= " in columns 9–10 (FITS 4.0 §4.1.2.2); a HIERARCH
 * card (ESO convention) carries its long keyword before a "=". Cards without a value indicator, or
 * with a keyword outside FITS 4.0 §4.1.2.1's characters, are commentary. A value that cannot be parsed
 * gives kind "invalid" with the raw text as value (astropy likewise reads such files and complains
 * only when the value is used).
 */
export function parseCard(text: string): FitsCard {
  const keyword = text.slice(0, 8).replace(/ +$/, "");
  if (keyword === "HIERARCH") {
    const eq = text.indexOf("=", 8);
    if (eq > 8) {
      const parsed = parseValueField(text.slice(eq + 1));
      if (parsed !== null) {
        const long = text.slice(8, eq).trim().replace(/\s+/g, " ");
        return { keyword: long, ...parsed, text };
      }
    }
    return { keyword, value: null, kind: "commentary", valueText: "", comment: text.slice(8).trimEnd(), text };
  }
  if (isValidKeyword(keyword) && text.slice(8, 10) === "= " && keyword !== "COMMENT" && keyword !== "HISTORY" && keyword !== "") {
    const field = text.slice(10);
    const parsed = parseValueField(field);
    if (parsed === null) return { keyword, value: field.trim(), kind: "invalid", valueText: field.trim(), comment: "", text };
    return { keyword, ...parsed, text };
  }
  return { keyword, value: null, kind: "commentary", valueText: "", comment: text.slice(8).trimEnd(), text };
}
