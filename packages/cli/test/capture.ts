/** Run the CLI in-process with stdout and stderr captured (test helper). */
import { vi } from "vitest";
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
