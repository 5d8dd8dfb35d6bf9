import type { ObservationConfig } from '../config/arcsiftConfig.js';
import { pixelGrid, type PixelGrid } from '../imaging/pixelGrid.js';

// The observation's PSF and mask are built where the data loader also needs them (src/data/).
export { psfOfObservation } from '../data/psfOfObservation.js';
export { maskOfObservation } from '../data/maskOfObservation.js';

/** The pixel grid an observation config describes. */
export function gridOfObservation(observation: ObservationConfig): PixelGrid {
  return pixelGrid(observation.columns, observation.rows, observation.pixelScaleArcsec, 'observation');
}
