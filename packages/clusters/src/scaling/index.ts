export { a10YmRelation, planck2014YmRelation } from "./ym.js";
export type { YmRelation, A10YmOptions, Planck2014YmOptions } from "./ym.js";
export { m500FromY } from "./invert.js";
export type { MassFromY, MassFromYOptions, YMeasurement } from "./invert.js";
export { temperatureFromMassKeV, massFromTemperatureMsun } from "./tm.js";
