/**
 * Example 3 — make a Compton-y map: a constrained ILC (unit tSZ response, zero CMB response) of a
 * simulated invented field, written as FITS with its effective beam and the ILC bias fraction.
 *
 *   npx tsx docs/examples/03-make-ymap.ts
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { buildYMap, ilcBandsFromStack, loadBandStack } from "@umbra/estimators";
import { writeSkyMapFits } from "@umbra/maps";
import { loadScenario, simulateField, writeSimulatedField } from "@umbra/simulate";

const out = mkdtempSync(join(tmpdir(), "umbra-example-"));
const scenarioFile = new URL("../../fixtures/scenarios/deep-small-field.json", import.meta.url).pathname;
const { scenario, cmbTable } = await loadScenario(scenarioFile);
await writeSimulatedField(simulateField(scenario, 8, cmbTable === undefined ? {} : { cmbTable }), out);

const stack = await loadBandStack(join(out, "bands.json"));
const product = buildYMap(ilcBandsFromStack(stack), stack.geometry, { ilc: "constrained", deproject: ["cmb"] });
await writeSkyMapFits(join(out, "y.fits"), { data: product.y, nx: stack.nx, ny: stack.ny, wcs: stack.wcs }, { bunit: "Compton-y" });

let max = -Infinity;
for (const v of product.y) if (v > max) max = v;
console.log(`y map: ${stack.nx}×${stack.ny}, effective beam ${product.effectiveFwhmArcmin.toFixed(2)}′ FWHM, brightest pixel y = ${max.toExponential(2)}`);
for (const d of product.domains) console.log(`domain: ILC bias fraction ${(100 * d.biasFraction).toFixed(3)} %, weights ${Array.from(d.weights, (w) => w.toExponential(2)).join(", ")}`);
console.log(`written: ${join(out, "y.fits")}`);
