/**
 * A small worker-thread pool for regression realisations (independent skies): each worker takes
 * the next seed when it is free. Results come back in completion order; callers sort by seed, so
 * the output does not depend on the number of workers.
 */
import { Worker } from "node:worker_threads";
import { UmbraError } from "@umbra/core";
import type { RealisationJob } from "./worker.js";
import type { RealisationResult } from "./types.js";

/** Run `jobs` on `workers` threads; `onResult` is called as each finishes. Rejects on the first failure. */
export async function runPool(jobs: readonly RealisationJob[], workers: number, onResult: (r: RealisationResult) => void | Promise<void>): Promise<void> {
  if (jobs.length === 0) return;
  const n = Math.max(1, Math.min(workers, jobs.length));
  const queue = [...jobs];
  const threads: Worker[] = [];
  try {
    await new Promise<void>((resolveAll, rejectAll) => {
      let running = 0;
      let failed = false;
      const feed = (w: Worker): void => {
        const job = queue.shift();
        if (job === undefined) {
          if (running === 0) resolveAll();
          return;
        }
        running++;
        w.postMessage(job);
      };
      for (let i = 0; i < n; i++) {
        // the entry registers tsx's loader in the thread (threads do not inherit the parent's module hooks)
        const w = new Worker(new URL("./worker-entry.mjs", import.meta.url), { execArgv: [] });
        threads.push(w);
        w.on("message", (msg: { ok: true; result: RealisationResult } | { ok: false; seed: number; message: string }) => {
          running--;
          if (failed) return;
          if (!msg.ok) {
            failed = true;
            rejectAll(new UmbraError("NUMERIC", `realisation seed ${msg.seed} failed in a worker: ${msg.message}`, { field: "seed", value: msg.seed }));
            return;
          }
          Promise.resolve(onResult(msg.result)).then(
            () => {
              if (queue.length === 0 && running === 0) resolveAll();
              else feed(w);
            },
            (e: unknown) => {
              failed = true;
              rejectAll(e);
            },
          );
        });
        w.on("error", (e) => {
          if (!failed) {
            failed = true;
            rejectAll(e);
          }
        });
        feed(w);
      }
    });
  } finally {
    await Promise.all(threads.map((t) => t.terminate()));
  }
}
