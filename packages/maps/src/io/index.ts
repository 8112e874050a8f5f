export { writeFileAtomic, tempPathFor } from "./atomic.js";
export { sha256Hex, sha256File } from "./hash.js";
export { makeProvenance, stableJson } from "./provenance.js";
export type { Provenance, ProvenanceInput } from "./provenance.js";
