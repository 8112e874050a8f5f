/**
 * File fingerprints for provenance: SHA-256 (FIPS 180-4) of a file's bytes, as lower-case hex.
 */
import { createHash } from "node:crypto";
import { createReadStream } from "node:fs";
import { UmbraError } from "@umbra/core";

/** SHA-256 of `bytes` as 64 lower-case hex digits (FIPS 180-4). */
export function sha256Hex(bytes: Uint8Array | string): string {
  return createHash("sha256").update(bytes).digest("hex");
}

/** SHA-256 of the file at `path`, streamed (64 lower-case hex digits). NOT_FOUND when it does not exist. */
export async function sha256File(path: string): Promise<string> {
  const hash = createHash("sha256");
  try {
    for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new UmbraError(code === "ENOENT" ? "NOT_FOUND" : "BAD_OPTION", `cannot read for hashing: ${e instanceof Error ? e.message : String(e)}`, {
      file: path,
    });
  }
  return hash.digest("hex");
}
