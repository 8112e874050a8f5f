/**
 * Example 1 — load maps: simulate a small invented field to a folder, then read its band manifest
 * and FITS maps back and describe them (what `umbra inspect` shows, from a script).
 *
 *   npx tsx docs/examples/01-load-maps.ts [OUT_DIR]
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { flatGeometry, loadBandManifest, pixelToWorld, readFitsImage } from "@umbra/maps";
import { parseScenario, simulateField, writeSimulatedField } from "@umbra/simulate";
import { radToArcmin } from "@umbra/core";

const out = process.argv[2] ?? mkdtempSync(join(tmpdir(), "umbra-example-"));

// An invented two-band field (a made-up survey "PLOVER"), 128² pixels of 0.5′.
const scenario = parseScenario({
  name: "plover-example",
  field: { nx: 128, ny: 128, pixelArcmin: 0.5, projection: "TAN", centerDeg: [10, -30], fieldId: "PLOVER-X1" },
  bands: [
    { name: "p090", frequencyGHz: 90, beamFwhmArcmin: 2.0, unit: "uK_CMB", noiseUKArcmin: 10 },
    { name: "p150", frequencyGHz: 150, beamFwhmArcmin: 1.3, unit: "MJy/sr", noiseUKArcmin: 10 },
  ],
  sky: { cmb: { spectrum: "lcdm2018" }, clusters: { list: [{ id: "PLOVER-C1", raDeg: 10, decDeg: -30, m500Msun: 6e14, z: 0.4 }] } },
}, "example scenario");
const field = simulateField(scenario, 11);
await writeSimulatedField(field, out);

const { manifest, warnings } = await loadBandManifest(join(out, "bands.json"));
for (const w of warnings) console.warn(`warning: ${w}`);
for (const band of manifest.bands) {
  const img = await readFitsImage(band.mapPath);
  const m = img.map;
  const g = flatGeometry(m);
  const centre = pixelToWorld(m.wcs!, (m.nx - 1) / 2, (m.ny - 1) / 2);
  let min = Infinity, max = -Infinity;
  for (const v of m.data) { if (v < min) min = v; if (v > max) max = v; }
  console.log(
    `${band.name}: ${band.frequencyGHz} GHz, ${m.nx}×${m.ny} px of ${radToArcmin(g.dxRad).toFixed(2)}′, ` +
      `centre (${centre.lonDeg.toFixed(3)}°, ${centre.latDeg.toFixed(3)}°), unit ${img.bunit}, range ${min.toExponential(2)} … ${max.toExponential(2)}`,
  );
}
console.log(`files in ${out}`);
