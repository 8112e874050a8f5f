/** Radio source draws: broken power-law counts and spectral-index distribution. */
import { describe, expect, it } from "vitest";
import { createRng } from "@umbra/core";
import { drawFluxJy, drawRadioSources, fieldWcs, parseScenario } from "../src/index.js";

const radio = { refFrequencyGHz: 150, densityPerDeg2: 50, minFluxJy: 0.001, maxFluxJy: 1, slope: 2.0, breakFluxJy: 0.01, slopeAbove: 3.0, alphaMean: -0.5, alphaSigma: 0.2, fractionInClusters: 0 };
const s = parseScenario(
  { name: "radio", field: { nx: 256, ny: 256, pixelArcmin: 1, fieldId: "RADIO" }, bands: [{ name: "a", frequencyGHz: 150, beamFwhmArcmin: 1, noiseUKArcmin: 0 }], sky: { radio } },
  "radio.json",
);

describe("radio counts", () => {
  it("puts the expected fraction of sources above the break of a continuous broken power law", () => {
    // ∫ S^-2 from 1 mJy to 10 mJy = 900; above: 0.01^(3-2) ∫ S^-3 from 0.01 to 1 = 0.01·(0.01^-2 − 1)/2 = 49.995 (hand integration)
    const pAbove = 49.995 / (900 + 49.995);
    const rng = createRng(1);
    const n = 20000;
    let above = 0;
    let inRange = true;
    for (let i = 0; i < n; i++) {
      const f = drawFluxJy(s.sky.radio!, rng);
      if (!(f >= 0.001 && f <= 1)) inRange = false;
      if (f > 0.01) above++;
    }
    expect(inRange).toBe(true);
    // binomial standard error sqrt(p(1−p)/n); 4σ
    expect(above / n).toAllClose(pAbove, { atol: 4 * Math.sqrt((pAbove * (1 - pAbove)) / n) });
  });
  it("draws spectral indices with the stated mean and spread, and a Poisson number of sources", () => {
    const src = drawRadioSources(s, fieldWcs(s.field), [], createRng(2));
    const lambda = 50 * (256 * 256) / 3600; // 910 per field
    expect(Math.abs(src.length - lambda)).toBeLessThan(4 * Math.sqrt(lambda));
    const a = src.map((x) => x.alpha);
    const mean = a.reduce((p, q) => p + q, 0) / a.length;
    const sd = Math.sqrt(a.reduce((p, q) => p + (q - mean) ** 2, 0) / (a.length - 1));
    expect(mean).toAllClose(-0.5, { atol: (4 * 0.2) / Math.sqrt(a.length) });
    expect(sd).toAllClose(0.2, { atol: (4 * 0.2) / Math.sqrt(2 * a.length) });
    expect(src.every((x) => Number.isInteger(x.xPix) && Number.isInteger(x.yPix) && x.hostClusterId === "")).toBe(true);
  });
});
