export { complexFftPlan, realFftPlan, type ComplexFftPlan, type RealFftPlan } from './fft.js';
export { WINDOW_NAMES, makeWindow, windowFigures, type WindowFigures, type WindowName, type WindowOptions } from './windows.js';
export { DETREND_KINDS, detrendInto, type DetrendKind } from './detrend.js';
export {
  createWelchPlan,
  medianBias,
  oneSidedDensityScale,
  segmentCount,
  welch,
  welchFrequencies,
  type AverageKind,
  type WelchOptions,
  type WelchPlan,
  type WelchResult,
} from './welch.js';
