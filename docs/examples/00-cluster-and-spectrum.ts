/**
 * Example 0 — the README's library snippet: the angular size of a cluster and the tSZ response of
 * a band.
 *
 *   npx tsx docs/examples/00-cluster-and-spectrum.ts
 */
import { cosmologyPreset, theta500Arcmin } from "@umbra/clusters";
import { componentResponse } from "@umbra/spectra";

const cosmo = cosmologyPreset("concordance");
const theta = theta500Arcmin(6e14, 0.5, cosmo); // arcmin
const dT150 = componentResponse({ kind: "tsz" }, { frequencyGHz: 150 }, "uK_CMB"); // µK_CMB per unit y
console.log({ theta, dT150 });
console.log(`a y0 = 1e-4 cluster at 150 GHz: ${(1e-4 * dT150).toFixed(1)} µK_CMB at the centre, θ500 = ${theta.toFixed(2)}′`);
