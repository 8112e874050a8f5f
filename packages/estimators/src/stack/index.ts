export type { BandStack, StackBand, InputFile } from "./types.js";
export { loadBandStack } from "./load.js";
export type { LoadStackOptions } from "./load.js";
export { bandSed, stackSedProvider } from "./seds.js";
