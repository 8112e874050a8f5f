/**
 * Atomic file replacement: write a temporary file beside the target, then rename it over the
 * target (rename within one directory is atomic on POSIX file systems), so a reader never sees a
 * half-written file and a crash leaves the old file intact. Common practice, no source.
 */
import { randomBytes } from "node:crypto";
import { rename, unlink, writeFile } from "node:fs/promises";
import { basename, dirname, join } from "node:path";

/** Write `data` to `path` atomically (temp file in the same directory + rename). */
export async function writeTextAtomic(path: string, data: string | Uint8Array): Promise<void> {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(4).toString("hex")}.tmp`);
  try {
    await writeFile(tmp, data);
    await rename(tmp, path);
  } catch (e) {
    await unlink(tmp).catch(() => undefined);
    throw e;
  }
}
