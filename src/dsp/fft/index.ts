export { FftPlan, getFftPlan, cachedPlanCount, isPowerOfTwo, assertFftSize, MAX_FFT_SIZE } from './plan';
export { fft, ifft, realFft } from './transform';
