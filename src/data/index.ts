export type { ObservedData, ObservedDataFiles } from './observedData.js';
export { loadObservedData, type ObservedDataExpectation } from './loadObservedData.js';
export { DATA_FILE_NAMES, DATA_FILE_ROLES, resolveDataFiles, type DataFileRole, type ObservedDataSource } from './dataFiles.js';
export { readDataImage } from './readDataImage.js';
export { dataPixelScaleArcsec, PIXEL_SCALE_RELATIVE_TOLERANCE, type DataImage } from './dataPixelScale.js';
export { dataMaskFromValues, fullDataMask, type DataMask } from './dataMask.js';
export { maskedPixelValues, type MaskedPixelValues } from './maskedPixelValues.js';
export { sharedFloat64Array, sharedInt32Array, sharedUint8Array } from './sharedArrays.js';
