export * from "./cmb/index.js";
export * from "./scenario/index.js";
export * from "./sky/index.js";
export * from "./regression/index.js";
export * from "./output/index.js";
