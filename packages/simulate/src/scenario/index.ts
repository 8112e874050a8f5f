export { scenarioSchema } from "./schema.js";
export type { Scenario, ScenarioBand, ScenarioClusterRow } from "./schema.js";
export { parseScenario } from "./parse.js";
export { loadScenario } from "./load.js";
export type { LoadedScenario } from "./load.js";
