export * from "./plan.js";
export * from "./measure.js";
export * from "./search.js";
