/**
 * Worker threads that run umbra's TypeScript modules. Threads start without the parent's module
 * hooks, so every umbra thread starts on ./worker-entry.mjs, which registers tsx's loader and then
 * imports the module named here.
 */
import { Worker, workerData } from "node:worker_threads";

/** Start a worker thread that runs the TypeScript (or JavaScript) module at `module` (a file URL). */
export function startWorker(module: URL): Worker {
  return new Worker(new URL("./worker-entry.mjs", import.meta.url), { execArgv: [], workerData: { module: module.href, umbraWorker: true } });
}

/** Whether this thread was started by {@link startWorker} (a test runner's own threads are not). */
export function isUmbraWorker(): boolean {
  return (workerData as { umbraWorker?: unknown } | null)?.umbraWorker === true;
}
