export { writeSimulatedField, SIMULATOR_NAME } from "./write.js";
export type { WrittenField } from "./write.js";
export { encodeFitsImage, formatCard, writeBandFits } from "./fits.js";
export type { OutCard } from "./fits.js";
export { clusterTruthRows, radioTruthRows, CLUSTER_TRUTH_EXTRA_COLUMNS, RADIO_TRUTH_COLUMNS } from "./truth.js";
