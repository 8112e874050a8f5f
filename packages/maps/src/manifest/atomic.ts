/**
 * Atomic text/bytes output for manifests and CSV tables: delegates to the one atomic writer in
 * `io/atomic.ts` (temporary file in the same folder, fsync, rename; common practice, no source).
 * Kept under this name because other packages import `writeTextAtomic`.
 */
import { writeFileAtomic } from "../io/atomic.js";

/**
 * Write `data` (UTF-8 text or bytes) to `path` atomically.
 * @throws UmbraError NOT_FOUND when the folder does not exist, BAD_OPTION on other write failures.
 */
export async function writeTextAtomic(path: string, data: string | Uint8Array): Promise<void> {
  await writeFileAtomic(path, data);
}
