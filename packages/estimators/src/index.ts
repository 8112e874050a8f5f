export * from "./stack/index.js";
export * from "./noise/index.js";
export * from "./mmf/index.js";
export * from "./photometry/index.js";
export * from "./search/index.js";
export * from "./sources/index.js";
export * from "./ilc/index.js";
export * from "./aperture/index.js";
