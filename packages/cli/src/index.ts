export { buildProgram, run } from "./main.js";
export { VERSION } from "./version.js";
export { runRealisation, stackFromSimulatedField } from "./commands/regress.js";
export type { RealisationRun, RealisationOptions } from "./commands/regress.js";
export { runDemo } from "./demo/run.js";
export type { DemoOptions, DemoSummary } from "./demo/run.js";
