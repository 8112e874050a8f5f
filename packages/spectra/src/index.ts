export {
  PLANCK_H_JS,
  BOLTZMANN_K_JPK,
  SPEED_OF_LIGHT_MPS,
  ELEMENTARY_CHARGE_C,
  ELECTRON_REST_ENERGY_KEV,
  THOMSON_CROSS_SECTION_M2,
  T0_K,
  MJY_PER_SR_SI,
  HZ_PER_GHZ,
  thetaFromKeV,
} from "./constants.js";
export {
  dimensionlessFrequency,
  frequencyFromDimensionless,
  planckIntensity,
  dPlanckdT,
  rayleighJeansPerK,
  cmbIntensityScale,
  blackbodyDerivativeShape,
} from "./planck.js";
export type { Bandpass, BandSpec, ComponentSpec, ComponentKind, Spectrum } from "./types.js";
export { COMPONENT_KINDS } from "./types.js";
export { gaussLegendre } from "./gaussLegendre.js";
export type { GaussRule } from "./gaussLegendre.js";
export {
  validateBandpass,
  bandQuadrature,
  isBandpassBand,
  bandReferenceFrequency,
  bandIntegral,
  effectiveFrequency,
} from "./bandpass.js";
export type { BandQuadrature } from "./bandpass.js";
export { unitReferenceSpectrum, unitBandResponse, unitConversionFactor } from "./unitConversion.js";
export type { UnitOptions } from "./unitConversion.js";
export { tszShape, tszTemperatureShape, tszIntensity } from "./tsz.js";
export {
  tszResponseRelativistic,
  tszIntensityRelativistic,
  tszRelativisticShapeExact,
  checkElectronTemperature,
  MAX_KTE_KEV,
} from "./tszRelativistic.js";
export type { RelativisticQuadrature } from "./tszRelativistic.js";
export { itohCoefficients, tszItohExpansion, tszCrossoverItoh } from "./tszItoh.js";
export { createFastRelativisticTsz, defaultFastRelativisticTsz, relativisticTszIntensityFast } from "./tszFast.js";
export type { FastRelativisticTsz } from "./tszFast.js";
export { buildRelativisticTszTable } from "./tszTableBuild.js";
export type { RelativisticTszTable, TableSettings } from "./tszTableBuild.js";
export { KSZ_TEMPERATURE_SHAPE, kszIntensity } from "./ksz.js";
export { cmbIntensity, dustSpectrum, cibSpectrum, radioSpectrum } from "./foregrounds.js";
export { componentSpectrum, componentResponse, componentEffectiveFrequency } from "./components.js";
export type { ResponseOptions } from "./components.js";
export { mixingMatrix, mixingColumn } from "./mixing.js";
export type { MixingMatrix } from "./mixing.js";
export { createTszBandResponse } from "./tszBand.js";
export type { TszBandResponse } from "./tszBand.js";
