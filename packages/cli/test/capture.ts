/** Run the CLI in-process with stdout and stderr captured (test helper). */
import { afterEach, beforeEach, vi } from "vitest";
import { run } from "../src/main.js";

/** Run `umbra argv…`; resolves to the exit code and what was written to stdout and stderr. */
export async function capture(argv: readonly string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const o = vi.spyOn(process.stdout, "write").mockImplementation((s: string | Uint8Array) => {
    out += String(s);
    return true;
  });
  const e = vi.spyOn(process.stderr, "write").mockImplementation((s: string | Uint8Array) => {
    err += String(s);
    return true;
  });
  try {
    return { code: await run(argv), out, err };
  } finally {
    o.mockRestore();
    e.mockRestore();
    process.exitCode = undefined;
  }
}

/**
 * Capture stdout and stderr around every test of the calling file (registers beforeEach/afterEach);
 * read them through the returned object's `out` and `err`.
 */
export function captureOutputEachTest(): { out: string; err: string } {
  const io = { out: "", err: "" };
  beforeEach(() => {
    io.out = "";
    io.err = "";
    vi.spyOn(process.stdout, "write").mockImplementation((s: string | Uint8Array) => {
      io.out += String(s);
      return true;
    });
    vi.spyOn(process.stderr, "write").mockImplementation((s: string | Uint8Array) => {
      io.err += String(s);
      return true;
    });
  });
  afterEach(() => {
    vi.restoreAllMocks();
    process.exitCode = undefined;
  });
  return io;
}
