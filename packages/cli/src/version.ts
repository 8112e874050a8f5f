/** umbra's version, written into every output's provenance block. */
export const VERSION = "0.1.0";
