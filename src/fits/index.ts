export { BITPIX_VALUES, bytesPerValue, isBitpix, type Bitpix } from './bitpix.js';
export { FITS_BLOCK_BYTES, FITS_CARD_BYTES, paddedToBlock } from './fitsBlock.js';
export { FitsHeader } from './header.js';
export {
  blankKeywordCard,
  commentCard,
  commentaryCard,
  complexFloatCard,
  complexIntegerCard,
  floatCard,
  historyCard,
  integerCard,
  logicalCard,
  stringCard,
  undefinedCard,
  type CommentaryCard,
  type ComplexFloatCard,
  type ComplexIntegerCard,
  type ComplexValue,
  type FloatCard,
  type HeaderCard,
  type HeaderCardKind,
  type IntegerCard,
  type LogicalCard,
  type StringCard,
  type UndefinedCard,
  type ValueCard,
} from './headerCard.js';
export { parseHeaderCard, parseValueField, type CardPlace, type ValueFieldReading } from './parseHeaderCard.js';
export { formatFloatValue, formatHeaderCard } from './formatHeaderCard.js';
export { parseHeader, type ParsedHeader } from './parseHeader.js';
export { formatHeader } from './formatHeader.js';
export { iterateHdus, listHdus, type FitsHduInfo } from './scanHdus.js';
export { decodePixels } from './decodePixels.js';
export { encodePixels, type PixelEncoding } from './encodePixels.js';
export { pixelScaleFromHeader, requireSquarePixelScaleArcsec, SQUARE_PIXEL_TOLERANCE, type PixelScale } from './pixelScale.js';
export { readFileBytes } from '../io/readFileBytes.js';
export { decodeFitsImage, readFitsImage, type FitsImage, type FitsImageSelection } from './readFits.js';
export {
  encodeFits,
  isImageHdu,
  isStructuralKeyword,
  writeFits,
  writeFitsImage,
  type FitsFileContent,
  type FitsHeaderOnlyHdu,
  type FitsImageHdu,
} from './writeFits.js';
export { parseFitsLocator, type FitsLocator } from './fitsLocator.js';
export { CelestialWcs, type CelestialWcsDescription, type SkyPosition } from './celestialWcs.js';
export { defaultLonpoleDeg, tanDeproject, tanProject, type TanPole } from './gnomonicProjection.js';
export { skyPositionAngleDeg, skySeparationDeg } from './skyBearing.js';
export { wcsLinearMatrix, type WcsLinearMatrix, type WcsMatrixSource } from './wcsLinearMatrix.js';
