/**
 * Atomic file output: write to a temporary file in the destination's folder, flush it to disk, then
 * rename it over the destination (rename within one file system is atomic on POSIX), so a reader
 * never sees a half-written file and a crash leaves the old file intact — common practice, no source.
 */
import { randomBytes } from "node:crypto";
import { open, rename, unlink } from "node:fs/promises";
import { basename, dirname, join } from "node:path";
import { UmbraError } from "@umbra/core";

/** The temporary name used while writing `path`: hidden, in the same folder, unique per call. */
export function tempPathFor(path: string): string {
  return join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(6).toString("hex")}.tmp`);
}

/**
 * Write `data` to `path` atomically (temporary file in the same folder, fsync, rename). Strings are
 * written as UTF-8. On failure the temporary file is removed and a BAD_OPTION error names the path
 * (NOT_FOUND when the folder does not exist).
 */
export async function writeFileAtomic(path: string, data: Uint8Array | string): Promise<void> {
  const tmp = tempPathFor(path);
  let handle: Awaited<ReturnType<typeof open>> | undefined;
  try {
    handle = await open(tmp, "wx", 0o644);
    await handle.writeFile(data);
    await handle.sync();
    await handle.close();
    handle = undefined;
    await rename(tmp, path);
  } catch (e) {
    if (handle !== undefined) await handle.close().catch(() => undefined);
    await unlink(tmp).catch(() => undefined);
    const code = (e as NodeJS.ErrnoException).code;
    const why = e instanceof Error ? e.message : String(e);
    throw new UmbraError(code === "ENOENT" ? "NOT_FOUND" : "BAD_OPTION", `cannot write output: ${why}`, { file: path });
  }
}
