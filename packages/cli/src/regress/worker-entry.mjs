// Entry of a regression worker thread. Worker threads start without the parent's module hooks, so
// this plain-JavaScript entry registers tsx's TypeScript loader in the thread, then loads the worker.
import { register } from "tsx/esm/api";

register();
await import("./worker.ts");
