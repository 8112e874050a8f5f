export type { PressureProfile } from "./types.js";
export { GNFW_PARAMETER_SETS, gnfwParameterSet, A10_UNIVERSAL, A10_ALPHA_P, A10_PIVOT_MSUN, gnfwShape, gnfwProfile, gnfwA10, a10AlphaPPrime, p500KeVCm3 } from "./gnfw.js";
export type { GnfwParams, GnfwSetName, A10Options } from "./gnfw.js";
export { betaModel } from "./beta.js";
export type { BetaModelOptions } from "./beta.js";
export { DEFAULT_TRUNCATION, lineOfSightIntegral, projectedShape, sphericalIntegral, cylindricalIntegral } from "./projection.js";
export {
  SIGMA_T_OVER_ME_C2_CM2_PER_KEV,
  clusterScale,
  centralY,
  yAtX,
  ySphMpc2,
  yCylMpc2,
  mpc2ToArcmin2At,
  y5r500Arcmin2,
  y5r500Mpc2,
  y500Arcmin2,
  templateAreaOverY0,
  y5r500OverY0Arcmin2,
} from "./integrated.js";
export type { ClusterScale } from "./integrated.js";
export { fourierShape, fourierShapeAt, fourierShapeLookup, profileFourierAtEll } from "./fourier.js";
export type { FourierShape, FourierShapeOptions } from "./fourier.js";
