/**
 * One simulated multi-band field: primary CMB, clusters (tSZ, relativistic when asked, kSZ),
 * dust/CIB with partial decorrelation between bands, radio sources, each band beam-convolved in
 * Fourier space (Gaussian beam of @umbra/maps), converted to its unit, plus correlated atmospheric 1/ℓ noise and white noise
 * with optional inhomogeneous depth. Deterministic: every random stream is a named fork of
 * createRng(seed), so the same scenario and seed give the same numbers on every machine.
 */
import { createRng, UmbraError } from "@umbra/core";
import { cosmologyPreset } from "@umbra/clusters";
import { ellOfModes, evaluateCl, gaussianBeam, getRfft2Plan, multiplyModes, type FlatGeometry, type Wcs } from "@umbra/maps";
import { componentResponse, unitConversionFactor, type BandSpec } from "@umbra/spectra";
import type { MapUnit } from "@umbra/core";
import { lcdmTtClK2 } from "../cmb/lcdmSpectrum.js";
import type { ClTable } from "../cmb/clTable.js";
import type { Scenario, ScenarioBand } from "../scenario/schema.js";
import { drawClusters, type TrueCluster } from "./clusterTruth.js";
import { relativeDepth } from "./depth.js";
import { fieldGeometry, fieldWcs } from "./field.js";
import { addScaledModes, modeAmplitudes, whiteModes } from "./modes.js";
import { exponentiate, lognormalPlan } from "./lognormal.js";
import { paintClusters } from "./paintClusters.js";
import { drawRadioSources, pixelSolidAngleSr, type TrueRadioSource } from "./radio.js";

/** Speed of light in km/s (exact). */
const C_KM_S = 299792.458;
const RAD_PER_ARCMIN = Math.PI / (180 * 60);

/** One simulated band: its description and its map in its own unit. */
export interface SimulatedBand {
  name: string;
  /** The band as @umbra/spectra describes it (delta frequency or bandpass). */
  band: BandSpec;
  frequencyGHz: number | null;
  beamFwhmArcmin: number;
  unit: MapUnit;
  /** Pixel values in `unit`, row-major, x fastest. */
  map: Float64Array;
  /** Inverse variance of the white noise per pixel in unit⁻², or null for a noiseless band. */
  ivar: Float64Array | null;
  /** Factor from K_CMB to the band's unit. */
  kcmbToUnit: number;
  /** White-noise σ per pixel at full depth, in the band's unit. */
  whiteSigmaPerPixel: number;
}

/** A simulated field with its truth. */
export interface SimulatedField {
  scenario: Scenario;
  seed: number;
  wcs: Wcs;
  geometry: FlatGeometry;
  bands: SimulatedBand[];
  clusters: TrueCluster[];
  /** Mass-function integral over the field (null for a user cluster list or no clusters). */
  expectedClusterCount: number | null;
  radioSources: TrueRadioSource[];
}

/** Options of {@link simulateField}. */
export interface SimulateOptions {
  /** The C_ℓ table a scenario's `sky.cmb.table` names, already read (see loadScenario). */
  cmbTable?: ClTable;
}

/** The band as @umbra/spectra wants it. */
export function scenarioBandSpec(b: ScenarioBand): BandSpec {
  if (b.bandpass) {
    return {
      bandpass: {
        frequencyGHz: Float64Array.from(b.bandpass.frequencyGHz),
        weight: Float64Array.from(b.bandpass.weight),
        ...(b.bandpass.refFrequencyGHz !== undefined ? { refFrequencyGHz: b.bandpass.refFrequencyGHz } : {}),
        name: b.name,
      },
    };
  }
  return { frequencyGHz: b.frequencyGHz! };
}

function cmbSpectrum(scenario: Scenario, opts: SimulateOptions): ((ell: number) => number) | null {
  const c = scenario.sky.cmb;
  if (!c) return null;
  if ("spectrum" in c) return lcdmTtClK2;
  const table = opts.cmbTable;
  if (!table) throw new UmbraError("BAD_SCENARIO", `sky.cmb.table '${c.table}' was not loaded: pass it as options.cmbTable (loadScenario does)`, { field: "sky.cmb.table" });
  const spec = { ell: table.ell, cl: table.clK2 };
  return (ell) => evaluateCl(spec, ell);
}

/**
 * Simulate `scenario` with `seed` (see module comment). Maps are in each band's unit; the truth
 * lists every cluster (with inField / nearEdge flags) and radio source.
 */
export function simulateField(scenario: Scenario, seed: number, opts: SimulateOptions = {}): SimulatedField {
  const rng = createRng(seed);
  const geom = fieldGeometry(scenario.field);
  const wcs = fieldWcs(scenario.field);
  const { nx, ny } = geom;
  const npix = nx * ny;
  const plan = getRfft2Plan(nx, ny);
  const layout = plan.layout;
  const ells = ellOfModes(layout, geom);
  const pixSr = pixelSolidAngleSr(scenario.field);
  const scratch = new Float64Array(npix);
  const bandSpecs = scenario.bands.map(scenarioBandSpec);
  const nb = scenario.bands.length;

  // sky spectra per band, in K_CMB
  const spectra = scenario.bands.map(() => new Float64Array(layout.spectrumLength));

  const clCmb = cmbSpectrum(scenario, opts);
  if (clCmb) {
    const w = whiteModes(plan, rng.fork("cmb"), scratch);
    const a = modeAmplitudes(ells, clCmb, pixSr);
    for (const s of spectra) addScaledModes(s, w, a, 1);
  }

  const dust = scenario.sky.dust;
  if (dust) {
    const ones = new Float64Array(layout.modeCount).fill(1);
    const c3000 = (2 * Math.PI * dust.dellAt3000UK2 * 1e-12) / (3000 * 3001);
    const a = modeAmplitudes(ells, (l) => c3000 * (l / 3000) ** dust.ellIndex, pixSr);
    const comp = { kind: "dust", beta: dust.beta, temperatureK: dust.temperatureK, refFrequencyGHz: dust.refFrequencyGHz } as const;
    const ref = componentResponse(comp, { frequencyGHz: dust.refFrequencyGHz }, "K_CMB");
    const drng = rng.fork("dust");
    if (dust.distribution === "lognormal") {
      // the log-normal transform acts on the Gaussian field g of each band (common √r, own √(1 − r));
      // band correlation: (exp(r σ_g²) − 1)/(exp(σ_g²) − 1), close to r for weak skewness (from the covariance relation above)
      const ln = lognormalPlan(plan, a, dust.lognormalRelativeRms, scratch);
      const common = whiteModes(plan, drng.fork("common"), scratch);
      const own = new Float64Array(layout.spectrumLength);
      const g = new Float64Array(layout.spectrumLength);
      scenario.bands.forEach((b, i) => {
        const scale = componentResponse(comp, bandSpecs[i]!, "K_CMB") / ref;
        g.fill(0);
        addScaledModes(g, common, ln.gaussianAmplitude, Math.sqrt(dust.bandCorrelation));
        if (dust.bandCorrelation < 1) {
          whiteModes(plan, drng.fork(`band:${b.name}`), scratch, own);
          addScaledModes(g, own, ln.gaussianAmplitude, Math.sqrt(1 - dust.bandCorrelation));
        }
        plan.inverse(g, scratch);
        exponentiate(scratch, ln);
        plan.forward(scratch, own);
        addScaledModes(spectra[i]!, own, ones, scale);
      });
    } else {
      const common = whiteModes(plan, drng.fork("common"), scratch);
      const own = new Float64Array(layout.spectrumLength);
      scenario.bands.forEach((b, i) => {
        const scale = componentResponse(comp, bandSpecs[i]!, "K_CMB") / ref;
        addScaledModes(spectra[i]!, common, a, scale * Math.sqrt(dust.bandCorrelation));
        if (dust.bandCorrelation < 1) {
          whiteModes(plan, drng.fork(`band:${b.name}`), scratch, own);
          addScaledModes(spectra[i]!, own, a, scale * Math.sqrt(1 - dust.bandCorrelation));
        }
      });
    }
  }

  const cosmo = cosmologyPreset(scenario.cosmology);
  const draw = drawClusters(scenario, cosmo, wcs, rng.fork("clusters"));
  const cs = scenario.sky.clusters;
  // a listed cluster outside the grid is kept in the truth (inField false) but not painted: the periodic transform would wrap it in
  const painted = draw.clusters.filter((c) => c.inField);
  if (cs && painted.length > 0) {
    const kszResp = bandSpecs.map((b) => componentResponse({ kind: "ksz" }, b, "K_CMB"));
    // kSZ amplitude relative to y0: (τ0/y0)(v/c)
    const kszRel = painted.map((c) => (c.tau0 / c.y0) * (c.vLosKmS / C_KM_S));
    if (cs.relativistic) {
      // the tSZ response depends on each cluster's kTe: paint straight into every band
      const amps = painted.map((c, j) => {
        const a = new Float64Array(nb);
        for (let i = 0; i < nb; i++) a[i] = componentResponse({ kind: "tsz", kTeKeV: c.kTeKeV }, bandSpecs[i]!, "K_CMB") + kszRel[j]! * kszResp[i]!;
        return a;
      });
      paintClusters(spectra, painted, amps, layout, ells, pixSr);
    } else {
      // one y spectrum (and one τv/c spectrum when there are velocities), then each band's response
      const withKsz = kszRel.some((v) => v !== 0);
      const comps = withKsz ? [new Float64Array(layout.spectrumLength), new Float64Array(layout.spectrumLength)] : [new Float64Array(layout.spectrumLength)];
      const amps = kszRel.map((k) => (withKsz ? Float64Array.of(1, k) : Float64Array.of(1)));
      paintClusters(comps, painted, amps, layout, ells, pixSr);
      bandSpecs.forEach((b, i) => {
        const r = componentResponse({ kind: "tsz" }, b, "K_CMB");
        const s = spectra[i]!;
        const y = comps[0]!;
        for (let k = 0; k < s.length; k++) s[k] = s[k]! + r * y[k]!;
        if (withKsz) {
          const t = comps[1]!;
          const rk = kszResp[i]!;
          for (let k = 0; k < s.length; k++) s[k] = s[k]! + rk * t[k]!;
        }
      });
    }
  }

  const radio = drawRadioSources(scenario, wcs, draw.clusters, rng.fork("radio"));
  const radioCfg = scenario.sky.radio;
  if (radioCfg && radio.length > 0) {
    const pointSpec = new Float64Array(layout.spectrumLength);
    scenario.bands.forEach((_, i) => {
      scratch.fill(0);
      for (const s of radio) {
        const resp = componentResponse({ kind: "radio", alpha: s.alpha, refFrequencyGHz: radioCfg.refFrequencyGHz }, bandSpecs[i]!, "K_CMB");
        scratch[s.yPix * nx + s.xPix] = scratch[s.yPix * nx + s.xPix]! + ((s.fluxJyRef * 1e-6) / pixSr) * resp;
      }
      plan.forward(scratch, pointSpec);
      const s = spectra[i]!;
      for (let k = 0; k < s.length; k++) s[k] = s[k]! + pointSpec[k]!;
    });
  }

  // beams, atmosphere, back to pixels, white noise, units
  const depth = relativeDepth(scenario);
  const atmRng = rng.fork("atmosphere");
  const atmCommon = scenario.bands.some((b) => b.atmosphere) ? whiteModes(plan, atmRng.fork("common"), scratch) : null;
  const atmOwn = new Float64Array(layout.spectrumLength);
  const rho = scenario.atmosphereCorrelation;
  const beamScratch = new Float64Array(layout.modeCount);
  const bands: SimulatedBand[] = scenario.bands.map((b, i) => {
    const s = spectra[i]!;
    const beam = gaussianBeam(b.beamFwhmArcmin);
    multiplyModes(s, beam.transferOnEll(ells, beamScratch), s); // B_ℓ = exp(−ℓ(ℓ+1)σ²/2), the maps package's convention
    const nWhite = (b.noiseUKArcmin * 1e-6 * RAD_PER_ARCMIN) ** 2; // white-noise C_ℓ in K²·sr
    if (b.atmosphere && atmCommon && nWhite > 0) {
      const { ellKnee, slope } = b.atmosphere;
      const a = modeAmplitudes(ells, (l) => nWhite * (l / ellKnee) ** slope, pixSr);
      addScaledModes(s, atmCommon, a, Math.sqrt(rho));
      if (rho < 1) {
        whiteModes(plan, atmRng.fork(`band:${b.name}`), scratch, atmOwn);
        addScaledModes(s, atmOwn, a, Math.sqrt(1 - rho));
      }
    }
    const map = new Float64Array(npix);
    plan.inverse(s, map);
    spectra[i] = new Float64Array(0); // release the spectrum
    const sigmaPix = (b.noiseUKArcmin * 1e-6) / scenario.field.pixelArcmin; // K_CMB per pixel
    const wrng = rng.fork(`white:${b.name}`);
    if (sigmaPix > 0) {
      for (let p = 0; p < npix; p++) map[p] = map[p]! + (sigmaPix / (depth ? Math.sqrt(depth[p]!) : 1)) * wrng.normal();
    }
    const k = unitConversionFactor("K_CMB", b.unit, bandSpecs[i]!, b.unit === "Jy/beam" ? { beamSolidAngleSr: beam.solidAngleSr } : undefined);
    for (let p = 0; p < npix; p++) map[p] = map[p]! * k;
    let ivar: Float64Array | null = null;
    if (sigmaPix > 0) {
      ivar = new Float64Array(npix);
      const base = 1 / (sigmaPix * k) ** 2;
      for (let p = 0; p < npix; p++) ivar[p] = base * (depth ? depth[p]! : 1);
    }
    return {
      name: b.name,
      band: bandSpecs[i]!,
      frequencyGHz: b.frequencyGHz ?? null,
      beamFwhmArcmin: b.beamFwhmArcmin,
      unit: b.unit,
      map,
      ivar,
      kcmbToUnit: k,
      whiteSigmaPerPixel: Math.abs(sigmaPix * k),
    };
  });
  return { scenario, seed, wcs, geometry: geom, bands, clusters: draw.clusters, expectedClusterCount: draw.expectedCount, radioSources: radio };
}
