/**
 * Inputs and outputs of forced photometry.
 */
import type { FitRunner } from "../parallel/fitPool.js";
import type { CovarianceOptions } from "../noise/estimate.js";
import type { BandCovariance } from "../noise/types.js";
import type { ProfileShape } from "../mmf/profile.js";
import type { ClusterFlag } from "./flags.js";
import type { FilterRadialProfile } from "../mmf/filterProfile.js";

/** One catalogue row (optional fields null when absent). */
export interface CatalogueCluster {
  readonly id: string;
  readonly raDeg: number;
  readonly decDeg: number;
  readonly theta500Arcmin?: number | null;
  readonly z?: number | null;
  readonly m500Msun?: number | null;
  readonly teKeV?: number | null;
  /** 1-based data row in the catalogue file, for messages. */
  readonly row?: number;
}

/** Cluster physics the photometry needs from @umbra/clusters (injected so the CLI picks cosmology and relations). */
export interface ClusterPhysics {
  /** θ500 in arcmin for M500 (M☉) at z. */
  theta500ArcminFromMass?(m500Msun: number, z: number): number;
  /** Electron temperature kTe in keV for M500 at z (a T–M relation). */
  temperatureKeVFromMass?(m500Msun: number, z: number): number;
  /** Angular diameter distance in Mpc. */
  angularDiameterDistanceMpc?(z: number): number;
  /**
   * M500 (M☉) and its 1σ error at z from the Y5R500 (arcmin², with error) measured in the aperture
   * of each trial θ500 (`yAt` re-fits the cluster at that size).
   */
  massFromY?(yAt: (theta500Arcmin: number) => { yArcmin2: number; yErrArcmin2: number }, z: number): { m500Msun: number; m500ErrMsun: number };
  /**
   * The same solution step by step (preferred when present): yields each trial θ500 (arcmin), takes
   * the Y measured there back through `next`, returns the mass. Lets many clusters be solved together.
   */
  massFromYSteps?(z: number): Generator<number, { m500Msun: number; m500ErrMsun: number }, { yArcmin2: number; yErrArcmin2: number }>;
}

/** Band SEDs in K_CMB per unit amplitude, one value per band. */
export interface SedProvider {
  /** tSZ per unit y; relativistic when kTeKeV > 0. */
  tsz(kTeKeV: number): Float64Array;
  /** kSZ per unit τ·v_r/c (ΔT/T0 = −τ v_r/c). */
  ksz(): Float64Array;
}

/** Options of forced photometry. */
export interface MeasureOptions {
  /** Profile shape with θ500 as its scale (Y5R500/y0 = θ500² g(0)). */
  readonly profile: ProfileShape;
  readonly seds: SedProvider;
  readonly physics?: ClusterPhysics;
  /** SEDs to null in every mode (constrained filter), e.g. CMB and/or dust. */
  readonly deproject?: readonly Float64Array[];
  /** Fit kSZ jointly with tSZ and report v_los. */
  readonly fitKsz?: boolean;
  /** Use the relativistic tSZ when te_kev is given or a T–M relation applies (default true). */
  readonly relativistic?: boolean;
  /** Sizes (arcmin) scanned when θ500 is unknown (default 15 log-spaced from 0.5 to 10). */
  readonly scanSizesArcmin?: readonly number[];
  /**
   * Iterations after the first pass (default 4): each subtracts all clusters, re-estimates the
   * covariance and updates every cluster jointly; stop when no y0 moves by more than `tolerance` σ
   * (default 0.02).
   */
  readonly maxIterations?: number;
  readonly tolerance?: number;
  /** S/N above which a point source (positive, in bands below 200 GHz) flags clusters within θ500 or a beam (default 5; 0 = off). */
  readonly pointSourceSnr?: number;
  /** Random positions for the empirical error (default 300; 0 = none). */
  readonly randomCount?: number;
  /** Seed of the random positions (default 1). */
  readonly seed?: number;
  /** Exclusion radius around catalogued clusters for random positions, arcmin (default 10). */
  readonly exclusionArcmin?: number;
  /** Edge taper width in arcmin (default 8). */
  readonly apodisationArcmin?: number;
  readonly covarianceOptions?: CovarianceOptions;
  /** A covariance from noise-only simulations to use instead of the data estimate (no iteration then). */
  readonly noiseCovariance?: BandCovariance;
  /** Called as work advances: stage name, items done, items in the stage (e.g. for a progress bar). */
  readonly onProgress?: ProgressCallback;
  /** Where the matched-filter fits run (default: this thread; see createFitPool for worker threads). Results do not depend on it. */
  readonly fitRunner?: FitRunner;
}

/** Progress of a long loop: `done` of `total` items of the named stage. */
export type ProgressCallback = (stage: string, done: number, total: number) => void;

/** Y and its error at one scanned size. */
export interface ScanPoint {
  readonly theta500Arcmin: number;
  readonly y0: number;
  readonly y0Err: number;
  readonly yArcmin2: number;
  readonly yErrArcmin2: number;
  readonly snr: number;
}

/** One cluster's result. NaN where not measured. */
export interface ClusterMeasurement {
  readonly id: string;
  readonly raDeg: number;
  readonly decDeg: number;
  /** 0-based pixel position. */
  readonly px: number;
  readonly py: number;
  readonly theta500Arcmin: number;
  /** Where θ500 came from. */
  readonly thetaSource: "catalog" | "mass" | "scan" | "none";
  readonly y0: number;
  readonly y0Err: number;
  readonly yArcmin2: number;
  readonly yErrArcmin2: number;
  readonly snr: number;
  /**
   * Empirical σ(y0) from random positions: (robust scatter of the filter at random positions ÷ its
   * analytic σ, interpolated in size) × this cluster's analytic σ. NaN when not computed.
   */
  readonly y0ErrRandom: number;
  /** kTe used for the relativistic response (0 = non-relativistic). */
  readonly teKeVUsed: number;
  readonly vLosKms: number;
  readonly vLosErrKms: number;
  readonly yMpc2: number;
  readonly yErrMpc2: number;
  readonly m500Msun: number;
  readonly m500ErrMsun: number;
  readonly flags: readonly ClusterFlag[];
  /** The size scan, when θ500 was scanned. */
  readonly scan: readonly ScanPoint[] | null;
}

/** Diagnostics of a photometry run. */
export interface MeasureDiagnostics {
  /** Cleaning iterations run and the largest change of y0 in σ at the last one. */
  readonly iterations: number;
  readonly lastChangeSigma: number;
  /** Largest condition number over covariance bins and the bins that needed diagonal loading. */
  readonly maxConditionNumber: number;
  readonly loadedBins: number;
  /** Random-position check per size (empty when disabled). */
  readonly randomScatter: readonly { thetaArcmin: number; sigmaAnalytic: number; sigmaRandom: number; count: number }[];
  readonly covarianceSource: "data" | "simulations";
  /** Point sources detected (all bands below 200 GHz, counted per band). */
  readonly pointSources: number;
  /** The filter's per-band radial profile in ℓ at the median catalogue size (null without sizes). */
  readonly filterProfile: FilterRadialProfile | null;
}

/** Result of forced photometry. */
export interface MeasureResult {
  readonly clusters: readonly ClusterMeasurement[];
  readonly diagnostics: MeasureDiagnostics;
}
