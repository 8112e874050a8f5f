export { readClusterCatalog, parseClusterCatalog } from "./read.js";
export type { ClusterRow, CatalogProblem, ClusterCatalog } from "./read.js";
export { writeCsvAtomic, writeClusterCatalog, toCsv, formatCsvNumber } from "./write.js";
export type { CsvValue } from "./write.js";
