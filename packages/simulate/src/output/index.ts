export { writeSimulatedField, SIMULATOR_NAME } from "./write.js";
export type { WrittenField, WriteFieldOptions } from "./write.js";
export { bandFitsHdu, simulatedBandCards, writeBandFits } from "./fits.js";
export { clusterTruthRows, radioTruthRows, CLUSTER_TRUTH_EXTRA_COLUMNS, RADIO_TRUTH_COLUMNS } from "./truth.js";
