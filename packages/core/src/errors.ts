/**
 * Typed errors. Every failure a user can cause (a bad file, keyword, manifest field, catalogue row,
 * option value) is an {@link UmbraError} with a stable `code` and the offending place named, so the
 * CLI can print one line and exit 2, and a pipeline can branch on `code`.
 */

/** Stable error codes; the CLI maps `BAD_*` and `NOT_FOUND` to exit code 2. */
export type UmbraErrorCode =
  | "BAD_FITS" // not FITS, truncated, missing END, size disagrees with NAXISn, unknown BITPIX
  | "BAD_WCS" // non-celestial or unknown projection, singular matrix
  | "BAD_MANIFEST" // band manifest fails validation
  | "BAD_CATALOG" // catalogue row or column problem
  | "BAD_SCENARIO" // simulation scenario fails validation
  | "BAD_VALUE" // a numeric argument out of its physical range
  | "BAD_OPTION" // a CLI option or library option that is unknown or malformed
  | "BAD_DATA" // data that cannot be used (all NaN, empty, not positive definite)
  | "NOT_FOUND" // a file that does not exist
  | "NUMERIC" // a numerical method failed to converge
  | "INTERNAL"; // a bug: should never reach a user

/** Where an error happened: any of the fields that apply. */
export interface ErrorPlace {
  file?: string;
  hdu?: number | string;
  keyword?: string;
  band?: string;
  field?: string;
  row?: number;
  value?: unknown;
}

/** An error with a stable code and the offending file / keyword / band / row named. */
export class UmbraError extends Error {
  readonly code: UmbraErrorCode;
  readonly place: ErrorPlace;
  /** Further problems found in the same validation pass (manifests report all at once). */
  readonly problems: readonly string[];

  constructor(code: UmbraErrorCode, message: string, place: ErrorPlace = {}, problems: readonly string[] = []) {
    super(formatMessage(message, place));
    this.name = "UmbraError";
    this.code = code;
    this.place = place;
    this.problems = problems;
  }
}

function formatMessage(message: string, place: ErrorPlace): string {
  const parts: string[] = [];
  if (place.file !== undefined) parts.push(place.file);
  if (place.hdu !== undefined) parts.push(`HDU ${String(place.hdu)}`);
  if (place.band !== undefined) parts.push(`band '${place.band}'`);
  if (place.row !== undefined) parts.push(`row ${place.row}`);
  if (place.keyword !== undefined) parts.push(`keyword ${place.keyword}`);
  if (place.field !== undefined) parts.push(`field '${place.field}'`);
  return parts.length > 0 ? `${parts.join(", ")}: ${message}` : message;
}

/** True when `e` is an {@link UmbraError} (optionally with the given code). */
export function isUmbraError(e: unknown, code?: UmbraErrorCode): e is UmbraError {
  return e instanceof UmbraError && (code === undefined || e.code === code);
}

/** Throw a BAD_VALUE error unless `x` is a finite number satisfying `ok`. */
export function requireFinite(name: string, x: number, ok: (v: number) => boolean = () => true, why = "out of range"): number {
  if (!Number.isFinite(x) || !ok(x)) {
    throw new UmbraError("BAD_VALUE", `${name} = ${String(x)} is ${Number.isFinite(x) ? why : "not a finite number"}`, {
      field: name,
      value: x,
    });
  }
  return x;
}
