/**
 * The demo's sky: an invented survey field ("HERON", an imaginary five-band millimetre survey), in
 * the scenario format of `@umbra/simulate` (docs/simulation.md). Every name, position and number
 * here is made up for the demo; nothing describes a real survey.
 */

/** Scenario JSON of the demo field; `quick` shrinks it for tests. */
export function demoScenario(quick: boolean): Record<string, unknown> {
  const n = quick ? 192 : 360;
  return {
    name: "heron-demo",
    description: `Invented five-band survey field HERON-D1: ${n}x${n} pixels of 0.5 arcmin (${((n * 0.5) / 60).toFixed(1)} deg square), CMB, dust/CIB, radio sources, correlated atmosphere and white noise; clusters drawn from the Tinker 2008 mass function.`,
    cosmology: "cmb2018",
    field: { nx: n, ny: n, pixelArcmin: 0.5, projection: "TAN", centerDeg: [37.5, -41.0], fieldId: "HERON-D1" },
    bands: [
      { name: "h090", frequencyGHz: 90, beamFwhmArcmin: 2.2, unit: "uK_CMB", noiseUKArcmin: 12, atmosphere: { ellKnee: 1500, slope: -3.5 } },
      { name: "h150", frequencyGHz: 150, beamFwhmArcmin: 1.4, unit: "uK_CMB", noiseUKArcmin: 10, atmosphere: { ellKnee: 2000, slope: -3.5 } },
      { name: "h220", frequencyGHz: 220, beamFwhmArcmin: 1.0, unit: "K_CMB", noiseUKArcmin: 30, atmosphere: { ellKnee: 3000, slope: -3.5 } },
      { name: "h280", frequencyGHz: 280, beamFwhmArcmin: 0.9, unit: "MJy/sr", noiseUKArcmin: 60, atmosphere: { ellKnee: 3500, slope: -3.5 } },
      { name: "h350", frequencyGHz: 350, beamFwhmArcmin: 0.8, unit: "MJy/sr", noiseUKArcmin: 200 },
    ],
    atmosphereCorrelation: 0.85,
    depth: { kind: "radial", minRelative: 0.6 },
    sky: {
      cmb: { spectrum: "lcdm2018" },
      clusters: { massFunction: { mMinMsun: quick ? 2e14 : 1.5e14, mMaxMsun: 3e15, zMin: 0.05, zMax: 1.5 }, scatterLnY: 0.2, relativistic: true },
      dust: { refFrequencyGHz: 220, dellAt3000UK2: 60, ellIndex: -1.2, beta: 1.6, temperatureK: 20, bandCorrelation: 0.95 },
      radio: { refFrequencyGHz: 150, densityPerDeg2: 1.5, minFluxJy: 0.002, maxFluxJy: 0.3, slope: 2.2, alphaMean: -0.7, alphaSigma: 0.3, fractionInClusters: 0 },
    },
  };
}
