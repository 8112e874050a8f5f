export type { HaloCosmology } from "./types.js";
export { naturalSpline, evalSpline, splineWithSecondDerivatives } from "./spline.js";
export type { NaturalSpline } from "./spline.js";
export { eh98Scales, eh98NoWiggleTransfer, DEFAULT_TCMB_K } from "./transfer.js";
export type { Eh98Scales } from "./transfer.js";
export { growthFactor } from "./growth.js";
export { linearPower, sigmaR, sigmaM, topHatWindow, meanMatterDensity0, lagrangianRadiusMpc } from "./power.js";
export type { LinearPower } from "./power.js";
export {
  TINKER08_TABLE2,
  tinker08Splines,
  tinker08Params,
  tinker08F,
  tinker08DnDlnM,
  omegaMatterAt,
  deltaCritToMean,
} from "./tinker.js";
export type { Tinker08Params, MassFunctionOptions } from "./tinker.js";
export { comovingVolumeElementMpc3, haloCountGrid, drawHalos } from "./population.js";
export type { HaloRange, HaloCountGrid, DrawnHalo } from "./population.js";
