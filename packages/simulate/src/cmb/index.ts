export { lcdmTtDellUK2, lcdmTtClK2, LCDM_TT_MAX_DEVIATION } from "./lcdmSpectrum.js";
export { parseClTable } from "./clTable.js";
export type { ClTable, ClColumn } from "./clTable.js";
