/**
 * The scenario file (JSON): what sky to simulate and how it is observed. One zod schema, strict
 * (unknown keys are errors, so a typo never passes silently); every default is written here.
 * The format is documented in docs/simulation.md.
 */
import { z } from "zod";

const positive = z.number().positive();
const nonNegative = z.number().nonnegative();
const finite = z.number().refine(Number.isFinite, "must be finite");

/** A tabulated bandpass: frequencies in GHz (increasing) and transmission weights. */
const bandpassSchema = z.strictObject({
  frequencyGHz: z.array(positive).min(2),
  weight: z.array(nonNegative).min(2),
  refFrequencyGHz: positive.optional(),
});

/** Atmospheric (or other 1/ℓ) noise of a band: N_ℓ = N_white (ℓ_knee/ℓ)^(−slope)… see docs. */
const atmosphereSchema = z.strictObject({
  /** Multipole where the 1/ℓ power equals the white-noise power. */
  ellKnee: positive,
  /** Power-law index of N_ℓ ∝ ℓ^slope (negative, e.g. −3.5). */
  slope: z.number().max(0),
});

const bandSchema = z
  .strictObject({
    name: z.string().regex(/^[A-Za-z0-9_.-]{1,32}$/, "1–32 letters, digits, '_', '.', '-'"),
    frequencyGHz: positive.optional(),
    bandpass: bandpassSchema.optional(),
    beamFwhmArcmin: positive,
    unit: z.enum(["K_CMB", "uK_CMB", "K_RJ", "MJy/sr", "Jy/beam"]).default("uK_CMB"),
    /** White-noise level in µK_CMB·arcmin (0: noiseless). */
    noiseUKArcmin: nonNegative,
    atmosphere: atmosphereSchema.optional(),
  })
  .refine((b) => (b.frequencyGHz === undefined) !== (b.bandpass === undefined), "give exactly one of frequencyGHz or bandpass");

const fieldSchema = z.strictObject({
  nx: z.number().int().min(16).max(16384),
  ny: z.number().int().min(16).max(16384),
  pixelArcmin: positive.max(60),
  projection: z.enum(["TAN", "CAR"]).default("TAN"),
  /** Field centre (RA, Dec) in degrees. */
  centerDeg: z.tuple([z.number().min(0).max(360), z.number().min(-90).max(90)]).default([0, 0]),
  /** An invented survey/field identifier written into the FITS headers. */
  fieldId: z.string().max(60).default("SIMFIELD"),
});

const depthSchema = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("uniform") }),
  /** Deep centre, shallower edges: relative inverse variance 1 − (1 − minRelative)(r/r_corner)². */
  z.strictObject({ kind: z.literal("radial"), minRelative: z.number().gt(0).max(1) }),
  /** A linear gradient along x from minRelative (left edge) to 1 (right edge). */
  z.strictObject({ kind: z.literal("gradient"), minRelative: z.number().gt(0).max(1) }),
]);

const cmbSchema = z.union([
  z.strictObject({ spectrum: z.literal("lcdm2018") }),
  z.strictObject({ table: z.string().min(1), column: z.enum(["dell_uK2", "cl_uK2"]).default("dell_uK2") }),
]);

const clusterRowSchema = z.strictObject({
  id: z.string().min(1).max(40),
  raDeg: z.number().min(0).max(360),
  decDeg: z.number().min(-90).max(90),
  m500Msun: z.number().min(1e12).max(1e16),
  z: z.number().gt(0).max(5),
  /** Line-of-sight peculiar velocity in km/s (positive: receding); default drawn or 0. */
  vLosKmS: finite.optional(),
  /** Electron temperature in keV; default from the T–M relation. */
  kTeKeV: z.number().gt(0).max(100).optional(),
});

const clusterSchema = z
  .strictObject({
    list: z.array(clusterRowSchema).optional(),
    massFunction: z
      .strictObject({
        mMinMsun: z.number().min(1e12),
        mMaxMsun: z.number().max(1e16),
        zMin: z.number().min(0.01),
        zMax: z.number().max(3),
      })
      .optional(),
    /** Log-normal scatter of Y at fixed mass, σ_lnY. */
    scatterLnY: nonNegative.max(2).default(0.2),
    /** Log-normal scatter of kTe at fixed mass, σ_lnT. */
    scatterLnT: nonNegative.max(2).default(0.1),
    /**
     * Paint the relativistic tSZ spectrum at each cluster's kTe (the default, as real clusters are);
     * false paints the non-relativistic spectrum (then measure with `--no-relativistic`).
     */
    relativistic: z.boolean().default(true),
    /** Peculiar velocities for kSZ: Gaussian with this σ in km/s; 0 switches kSZ off. */
    velocitySigmaKmS: nonNegative.max(3000).default(0),
    /** Keep clusters at least this far from the field edge (in units of θ500; mass-function draws only). */
    edgeMarginTheta500: nonNegative.default(1),
  })
  .refine((c) => (c.list === undefined) !== (c.massFunction === undefined), "give exactly one of list or massFunction");

const dustSchema = z.strictObject({
  /** Frequency (GHz) at which the amplitude is quoted. */
  refFrequencyGHz: positive,
  /** D_ℓ at ℓ = 3000 in µK_CMB² at the reference frequency. */
  dellAt3000UK2: positive,
  /** C_ℓ ∝ ℓ^ellIndex (e.g. −1.2 for clustered CIB, −2.6 for Galactic dust). */
  ellIndex: z.number().min(-5).max(1),
  beta: z.number().min(0).max(4),
  temperatureK: z.number().min(3).max(100),
  /** Correlation coefficient of the field between any two bands (1: one template scaled). */
  bandCorrelation: z.number().min(0).max(1).default(0.95),
  /** Gaussian field, or log-normal with the same two-point function (Coles & Jones 1991). */
  distribution: z.enum(["gaussian", "lognormal"]).default("gaussian"),
  /** For a log-normal field: rms over mean of the emission (sets how skewed it is). */
  lognormalRelativeRms: z.number().gt(0).max(5).default(0.5),
});

const radioSchema = z.strictObject({
  refFrequencyGHz: positive,
  /** Source density above minFluxJy, per square degree. */
  densityPerDeg2: positive.max(1e4),
  minFluxJy: positive,
  maxFluxJy: positive,
  /** Differential counts dN/dS ∝ S^(−slope) (Euclidean: 2.5). */
  slope: z.number().gt(1).max(4),
  /** Optional break: above breakFluxJy the slope becomes slopeAbove. */
  breakFluxJy: positive.optional(),
  slopeAbove: z.number().gt(1).max(4).optional(),
  /** Spectral index S ∝ ν^α drawn Gaussian with this mean and spread. */
  alphaMean: z.number().min(-3).max(3).default(-0.7),
  alphaSigma: nonNegative.max(2).default(0.3),
  /** Fraction of sources placed in clusters (within 0.5 θ500 of a centre). */
  fractionInClusters: z.number().min(0).max(1).default(0),
});

/** The whole scenario. */
export const scenarioSchema = z.strictObject({
  name: z.string().min(1).max(80),
  description: z.string().max(2000).optional(),
  /** Cosmology preset of @umbra/clusters (needs sigma8/ns for mass-function draws). */
  cosmology: z.string().default("cmb2018"),
  field: fieldSchema,
  bands: z.array(bandSchema).min(1).max(16),
  /** Correlation coefficient of the atmospheric component between bands. */
  atmosphereCorrelation: z.number().min(0).max(1).default(0.9),
  depth: depthSchema.default({ kind: "uniform" }),
  sky: z.strictObject({
    cmb: cmbSchema.optional(),
    clusters: clusterSchema.optional(),
    dust: dustSchema.optional(),
    radio: radioSchema.optional(),
  }),
});

/** A validated scenario with every default filled in. */
export type Scenario = z.infer<typeof scenarioSchema>;
/** One band of a scenario. */
export type ScenarioBand = Scenario["bands"][number];
/** One user-listed cluster of a scenario. */
export type ScenarioClusterRow = z.infer<typeof clusterRowSchema>;
