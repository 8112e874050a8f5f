// Entry of every umbra worker thread. Threads start without the parent's module hooks, so this
// plain-JavaScript entry registers tsx's TypeScript loader in the thread, then loads the worker
// module named in workerData (a file URL): the CLI pool's jobs or the estimators' fit threads.
import { register } from "tsx/esm/api";
import { workerData } from "node:worker_threads";

register();
await import(workerData.module);
