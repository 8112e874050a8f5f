/**
 * Example 4 — run a small regression: simulate two realisations of an invented scenario, measure
 * every true cluster and search blind, then summarise bias, pulls and completeness.
 *
 *   npx tsx docs/examples/04-run-regression.ts
 */
import { runRealisation } from "@umbra/cli";
import { loadScenario, regressionSummary, simulateField } from "@umbra/simulate";

const scenarioFile = new URL("../../fixtures/scenarios/deep-small-field.json", import.meta.url).pathname;
const { scenario, cmbTable } = await loadScenario(scenarioFile);
const records = [];
for (const seed of [101, 102]) {
  const field = simulateField(scenario, seed, cmbTable === undefined ? {} : { cmbTable });
  records.push(runRealisation(field).record);
}
const s = regressionSummary(records);
console.log(`${s.clustersTotal} clusters in ${s.realisations} realisations; pulls: mean ${s.pulls.mean.value.toFixed(2)} ± ${s.pulls.mean.error.toFixed(2)}, std ${s.pulls.std.value.toFixed(2)} ± ${s.pulls.std.error.toFixed(2)}`);
for (const c of s.completeness.filter((b) => b.n > 0)) console.log(`true S/N ${c.snrLo}–${c.snrHi}: completeness ${c.k}/${c.n}`);
