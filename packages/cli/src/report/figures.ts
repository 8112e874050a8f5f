/**
 * Figures that reports share (the demo and `umbra regress`): Y measured against true Y, pull
 * histograms, Y bias and completeness against true S/N, purity against threshold, and the SEDs of
 * the sky components with the bands marked.
 */
import { histogramChart, xyChart, type Figure } from "@umbra/plot";
import type { RealisationRecord, RegressionSummary } from "@umbra/simulate";
import { componentResponse, type ComponentSpec } from "@umbra/spectra";
import type { FilterRadialProfile } from "@umbra/estimators";

/** Standard normal density (the expected pull distribution). */
function unitNormal(x: number): number {
  return Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
}

/** Measured against true Y5R500 (arcmin², log–log, 1σ error bars) over all realisations. */
export function yMeasuredVsTrue(records: readonly RealisationRecord[]): Figure {
  const x: number[] = [];
  const y: number[] = [];
  const e: number[] = [];
  for (const r of records) {
    const truth = new Map(r.truth.map((t) => [t.id, t]));
    for (const f of r.forced) {
      const t = truth.get(f.id);
      if (t === undefined) continue;
      x.push(t.yArcmin2);
      y.push(f.yArcmin2);
      e.push(f.yErrArcmin2);
    }
  }
  return xyChart({
    name: "y-measured-vs-true",
    caption: `Forced-photometry Y5R500 against the simulated truth (arcmin², ${x.length} clusters), with 1σ errors; the dashed line is equality. Points far below the line at small Y are noise-dominated.`,
    title: "Y5R500: measured vs true",
    x: { label: "true Y5R500 [arcmin²]", log: true },
    y: { label: "measured Y5R500 [arcmin²]", log: true },
    series: [{ label: "clusters", x, y, yErr: e, style: "points" }],
    diagonal: true,
  });
}

/** Histogram of pulls (measured − true)/σ with the unit normal overlaid. */
export function pullHistogram(records: readonly RealisationRecord[], summary: RegressionSummary): Figure {
  const pulls: number[] = [];
  for (const r of records) {
    const truth = new Map(r.truth.map((t) => [t.id, t]));
    for (const f of r.forced) {
      const t = truth.get(f.id);
      if (t !== undefined && f.yErrArcmin2 > 0) pulls.push((f.yArcmin2 - t.yArcmin2) / f.yErrArcmin2);
    }
  }
  const edges = Array.from({ length: 25 }, (_, i) => -6 + i * 0.5);
  const p = summary.pulls;
  return histogramChart({
    name: "pulls",
    caption: `Pulls (measured − true Y5R500)/σ of ${pulls.length} clusters; mean ${p.mean.value.toFixed(2)} ± ${p.mean.error.toFixed(2)}, standard deviation ${p.std.value.toFixed(2)} ± ${p.std.error.toFixed(2)}. The dashed curve is the unit normal expected for unbiased, calibrated errors.`,
    title: "Pull distribution",
    values: pulls,
    edges,
    x: { label: "pull (measured − true)/σ" },
    overlayDensity: unitNormal,
    overlayLabel: "N(0, 1)",
  });
}

function binCentre(lo: number, hi: number): number {
  return hi > 1e8 ? lo * 1.5 : Math.sqrt(Math.max(lo, 0.5) * hi);
}

/** Fractional Y bias per true-S/N bin with its error. */
export function yBiasFigure(summary: RegressionSummary): Figure {
  const bins = summary.yBias.filter((b) => b.n > 0 && Number.isFinite(b.fractionalBias.value));
  return xyChart({
    name: "y-bias",
    caption: "Fractional bias of Y5R500, Σ(measured − true)/Σ true, in bins of true S/N (true Y over the measured error), with its standard error; the dashed line is zero bias.",
    title: "Y bias against true S/N",
    x: { label: "true S/N", log: true },
    y: { label: "fractional Y bias" },
    series: [{ label: "fractional bias", x: bins.map((b) => binCentre(b.snrLo, b.snrHi)), y: bins.map((b) => b.fractionalBias.value), yErr: bins.map((b) => b.fractionalBias.error), style: "points" }],
    hLines: [0],
  });
}

/** Blind-search completeness against true S/N, with 68 % Wilson intervals. */
export function completenessFigure(summary: RegressionSummary): Figure {
  const c = summary.completeness.filter((b) => b.n > 0);
  return xyChart({
    name: "completeness",
    caption: `Fraction of true clusters found by the blind search (raw S/N ≥ ${summary.options.completenessThreshold}, matched within ${summary.options.matchRadiusArcmin}′) in bins of true S/N, with 68 % Wilson intervals.`,
    title: "Completeness against true S/N",
    x: { label: "true S/N", log: true },
    y: { label: "completeness", min: 0, max: 1.05 },
    series: [{ label: "found / true", x: c.map((b) => binCentre(b.snrLo, b.snrHi)), y: c.map((b) => b.fraction), yErr: c.map((b) => 0.5 * (b.upper - b.lower)), style: "points" }],
    hLines: [0.9],
  });
}

/** Purity (matched / all candidates) against the detection threshold. */
export function purityFigure(summary: RegressionSummary): Figure {
  const p = summary.purity.filter((b) => b.n > 0);
  return xyChart({
    name: "purity",
    caption: "Fraction of blind candidates above each raw-S/N threshold that match a true cluster, with 68 % Wilson intervals.",
    title: "Purity against threshold",
    x: { label: "raw S/N threshold" },
    y: { label: "purity", min: 0, max: 1.05 },
    series: [{ label: "matched / candidates", x: p.map((b) => b.threshold), y: p.map((b) => b.fraction), yErr: p.map((b) => 0.5 * (b.upper - b.lower)), style: "points" }],
  });
}

/** The tSZ response per unit y in K_CMB (ΔT/T0 scaled by T0), non-relativistic and at kTe = 10 keV, with the bands marked. */
export function tszSedFigure(bands: readonly { name: string; frequencyGHz: number }[]): Figure {
  const f: number[] = [];
  for (let v = 10; v <= 600; v += 5) f.push(v);
  const resp = (c: ComponentSpec): number[] => f.map((v) => componentResponse(c, { frequencyGHz: v }, "K_CMB"));
  const bandX = bands.map((b) => b.frequencyGHz);
  return xyChart({
    name: "tsz-sed",
    caption: `Thermal SZ response in K_CMB per unit Compton y (= T0 · ΔT/T0 per y): non-relativistic and relativistic at kTe = 10 keV; points mark the bands (${bands.map((b) => b.name).join(", ")}). The null sits near 217 GHz.`,
    title: "tSZ spectrum and the bands",
    x: { label: "frequency [GHz]" },
    y: { label: "ΔT per unit y [K_CMB]" },
    series: [
      { label: "tSZ, kTe = 0", x: f, y: resp({ kind: "tsz" }) },
      { label: "tSZ, kTe = 10 keV", x: f, y: resp({ kind: "tsz", kTeKeV: 10 }) },
      { label: "bands (kTe = 0)", x: bandX, y: bands.map((b) => componentResponse({ kind: "tsz" }, { frequencyGHz: b.frequencyGHz }, "K_CMB")), style: "points" },
    ],
    hLines: [0],
  });
}

/** Foreground SEDs in K_CMB relative to their value at 150 GHz (log), with the bands marked. */
export function foregroundSedFigure(bands: readonly { name: string; frequencyGHz: number }[]): Figure {
  const f: number[] = [];
  for (let v = 20; v <= 600; v += 5) f.push(v);
  const rel = (c: ComponentSpec, xs: readonly number[]): number[] => {
    const r150 = componentResponse(c, { frequencyGHz: 150 }, "K_CMB");
    return xs.map((v) => componentResponse(c, { frequencyGHz: v }, "K_CMB") / r150);
  };
  const dust: ComponentSpec = { kind: "dust", beta: 1.6, temperatureK: 20, refFrequencyGHz: 353 };
  const radio: ComponentSpec = { kind: "radio", alpha: -0.7, refFrequencyGHz: 150 };
  const bandX = bands.map((b) => b.frequencyGHz);
  return xyChart({
    name: "foreground-seds",
    caption: "Foreground spectra in K_CMB, each normalised to 1 at 150 GHz: CMB (flat), modified-blackbody dust (β = 1.6, T_d = 20 K) and a radio power law (α = −0.7); points mark the bands on the dust curve.",
    title: "Foreground spectra",
    x: { label: "frequency [GHz]", log: true },
    y: { label: "response relative to 150 GHz (K_CMB)", log: true },
    series: [
      { label: "CMB", x: f, y: rel({ kind: "cmb" }, f) },
      { label: "dust", x: f, y: rel(dust, f) },
      { label: "radio", x: f, y: rel(radio, f) },
      { label: "bands", x: bandX, y: rel(dust, bandX), style: "points" },
    ],
  });
}

/** The matched filter's per-band weight against ℓ at one size (normalised; from measure's diagnostics). */
export function filterProfileFigure(p: FilterRadialProfile, bandNames: readonly string[]): Figure {
  return xyChart({
    name: "filter-profile",
    caption: `Matched-filter weight per band against multipole ℓ for θ500 = ${p.thetaArcmin.toFixed(2)}′ (the median catalogue size), Ψ_i(ℓ) ∝ [P⁻¹(a∘B)]_i τ̃(ℓ), normalised to a peak |Ψ| of 1 over all bands. Bands below the tSZ null enter with one sign, bands above with the other; large scales are suppressed where the CMB dominates.`,
    title: "Filter profile in ℓ",
    x: { label: "multipole ℓ" },
    y: { label: "filter weight (normalised)" },
    series: bandNames.map((name, i) => ({ label: name, x: p.ell, y: p.weights[i] ?? [] })),
    hLines: [0],
  });
}
