export type { BandStack, StackBand, InputFile } from "./types.js";
