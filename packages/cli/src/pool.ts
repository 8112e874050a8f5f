/**
 * A small worker-thread pool for independent jobs (regression realisations, sky tiles): each
 * thread takes the next job when it is free; results come back in completion order, so callers
 * that need a fixed order sort them (outputs never depend on the number of threads).
 *
 * A worker module calls {@link serveJobs} with its job function; {@link runPool} starts threads on
 * it with @umbra/core's startWorker (which registers tsx's TypeScript loader in the thread first:
 * threads do not inherit the parent's module hooks).
 */
import { parentPort, type Worker } from "node:worker_threads";
import { UmbraError, isUmbraWorker, startWorker } from "@umbra/core";

type Reply<R> = { ok: true; result: R } | { ok: false; message: string; code: string | null };

/**
 * Run `jobs` on `workers` threads of the worker module `module` (a file URL); `onResult` is called
 * as each job finishes. Rejects on the first failure, naming the job with `describe`.
 */
export async function runPool<J, R>(
  module: URL,
  jobs: readonly J[],
  workers: number,
  describe: (job: J) => string,
  onResult: (result: R, job: J) => void | Promise<void>,
): Promise<void> {
  if (jobs.length === 0) return;
  const n = Math.max(1, Math.min(workers, jobs.length));
  const queue = [...jobs];
  const threads: Worker[] = [];
  try {
    await new Promise<void>((resolveAll, rejectAll) => {
      let running = 0;
      let failed = false;
      const fail = (e: unknown): void => {
        if (failed) return;
        failed = true;
        rejectAll(e);
      };
      const feed = (w: Worker, current: { job: J | null }): void => {
        const job = queue.shift();
        if (job === undefined) {
          current.job = null;
          if (running === 0) resolveAll();
          return;
        }
        running++;
        current.job = job;
        w.postMessage(job);
      };
      for (let i = 0; i < n; i++) {
        const w = startWorker(module);
        threads.push(w);
        const current: { job: J | null } = { job: null };
        w.on("message", (msg: Reply<R>) => {
          running--;
          if (failed) return;
          const job = current.job as J;
          if (!msg.ok) {
            const code = msg.code === "BAD_DATA" || msg.code === "BAD_OPTION" || msg.code === "NOT_FOUND" ? msg.code : "NUMERIC";
            fail(new UmbraError(code, `${describe(job)} failed in a worker thread: ${msg.message}`));
            return;
          }
          Promise.resolve(onResult(msg.result, job)).then(() => feed(w, current), fail);
        });
        w.on("error", fail);
        feed(w, current);
      }
    });
  } finally {
    await Promise.all(threads.map((t) => t.terminate()));
  }
}

/** In a worker thread: answer every job posted by {@link runPool} with `run(job)`. */
export function serveJobs<J, R>(run: (job: J) => Promise<R> | R): void {
  const port = parentPort;
  // only in threads started by runPool (a test runner's own worker threads are left alone)
  if (port === null || !isUmbraWorker()) return;
  port.on("message", (job: J) => {
    Promise.resolve()
      .then(() => run(job))
      .then(
        (result) => port.postMessage({ ok: true, result } satisfies Reply<R>),
        (e: unknown) => port.postMessage({ ok: false, message: e instanceof Error ? e.message : String(e), code: e instanceof UmbraError ? e.code : null } satisfies Reply<R>),
      );
  });
}
