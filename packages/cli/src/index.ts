export { buildProgram, run } from "./main.js";
export { VERSION } from "./version.js";
