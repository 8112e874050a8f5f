export { createFitPool, serialFits, type FitRunner } from "./fitPool.js";
export type { FitRequest } from "./fitBatch.js";
