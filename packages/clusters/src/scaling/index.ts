export { a10YmRelation, planck2014YmRelation } from "./ym.js";
export type { YmRelation, A10YmOptions, Planck2014YmOptions } from "./ym.js";
export { m500FromY, m500FromYSteps } from "./invert.js";
export type { MassFromY, MassFromYOptions, MassFromYStepOptions, YAtTheta, YMeasurement } from "./invert.js";
export { temperatureFromMassKeV, massFromTemperatureMsun } from "./tm.js";
