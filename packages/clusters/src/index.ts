export * from "./halos/index.js";
