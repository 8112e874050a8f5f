/**
 * Random access to a FITS file's bytes: either a whole file held in memory (a gunzipped `.fits.gz`,
 * or bytes a caller already has) or an open file read block by block, so that reading one HDU of a
 * large file touches only its header blocks and its own data.
 */
import { closeSync, fstatSync, openSync, readSync } from "node:fs";
import { UmbraError } from "@umbra/core";

/** Bytes of one FITS file. */
export interface ByteSource {
  /** Total length in bytes. */
  readonly length: number;
  /** Up to `length` bytes from `offset` (fewer at the end of the file). The result may be a view: do not modify it. */
  read(offset: number, length: number): Uint8Array;
  /** Fill `target` with the bytes from `offset`; returns how many bytes were available. */
  readInto(offset: number, target: Uint8Array): number;
  /** The whole file in memory (reads it when the source is a file). */
  all(): Uint8Array;
  /** Release the file, if any. */
  close(): void;
}

/** A source over bytes already in memory. */
export function memorySource(bytes: Uint8Array): ByteSource {
  return {
    length: bytes.length,
    read: (offset, length) => bytes.subarray(Math.min(offset, bytes.length), Math.min(offset + length, bytes.length)),
    readInto(offset, target) {
      const part = bytes.subarray(Math.min(offset, bytes.length), Math.min(offset + target.length, bytes.length));
      target.set(part);
      return part.length;
    },
    all: () => bytes,
    close: () => undefined,
  };
}

/**
 * A source reading an open file on demand (synchronous reads; the caller closes it). Throws the
 * system error for a file that cannot be opened; BAD_FITS for a path that is not a regular file or a
 * read that fails.
 */
export function fileSource(path: string): ByteSource {
  const fd = openSync(path, "r");
  let length: number;
  try {
    const st = fstatSync(fd);
    if (!st.isFile()) throw new UmbraError("BAD_FITS", "not a regular file", { file: path });
    length = st.size;
  } catch (e) {
    closeSync(fd);
    throw e;
  }
  let closed = false;
  const readInto = (offset: number, target: Uint8Array): number => {
    let got = 0;
    const want = Math.max(0, Math.min(target.length, length - offset));
    try {
      while (got < want) {
        const k = readSync(fd, target, got, want - got, offset + got);
        if (k <= 0) break;
        got += k;
      }
    } catch (e) {
      throw new UmbraError("BAD_FITS", `read failed: ${e instanceof Error ? e.message : String(e)}`, { file: path });
    }
    return got;
  };
  return {
    length,
    read(offset, len) {
      const buf = new Uint8Array(Math.max(0, Math.min(len, length - offset)));
      const got = readInto(offset, buf);
      return got === buf.length ? buf : buf.subarray(0, got);
    },
    readInto,
    all() {
      const buf = new Uint8Array(length);
      readInto(0, buf);
      return buf;
    },
    close() {
      if (!closed) closeSync(fd);
      closed = true;
    },
  };
}
