export {
  type PixelGrid, pixelGrid, pixelCount, pixelCentreX, pixelCentreY,
  fillPixelCentres, fillSupersampledCentres, fillSubsetCentres, binSupersampled,
} from './pixelGrid.js';
export {
  type PsfKernel, type PsfSampling, type CheckedPsfKernel, PSF_SUM_TOLERANCE, checkPsfKernel, checkKernelSize, normaliseInPlace,
} from './psfKernel.js';
export { gaussianPsfKernel, GAUSSIAN_FWHM_PER_SIGMA, GAUSSIAN_PSF_HALF_WIDTH_FWHM } from './gaussianPsf.js';
export {
  moffatPsfKernel, moffatAlpha, MOFFAT_PSF_OUTSIDE_FRACTION, MOFFAT_PSF_MAX_HALF_WIDTH_FWHM,
} from './moffatPsf.js';
export type { ImageConvolver } from './imageConvolver.js';
export { FftConvolver, createConvolver, nextPowerOfTwo } from './convolver.js';
export { DirectConvolver, directConvolution } from './directConvolution.js';
export { noiseSigmaMap, addGaussianNoise } from './noise.js';
export {
  type PixelMask, allPixelsMask, annulusMask, discMask, maskFromImage, usedPixelIndices,
} from './mask.js';
export { pixelCentrePsf } from './pixelCentrePsf.js';
