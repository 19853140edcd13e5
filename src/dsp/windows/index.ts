export { windowFunction, isWindowName, WINDOW_NAMES, DEFAULT_KAISER_BETA } from './window-function';
export type { WindowName, WindowOptions } from './window-function';
export { coherentGain, enbwBins, scallopingLossDb, highestSideLobeDb, mainLobeHalfWidthBins } from './window-metrics';
export { besselI0 } from './bessel';
