import { CelestialWcs, type CelestialWcsDescription, type SkyPosition } from '../fits/index.js';

/** A posterior summary of an angle in degrees: median, 68% and 95% intervals. */
export interface AngleSummary {
  readonly median: number;
  readonly interval68: readonly [number, number];
  readonly interval95: readonly [number, number];
}

/** The image grid the sky is mapped onto: arcsift's image plane. */
export interface SkyGrid {
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
  readonly wcs?: CelestialWcsDescription;
}

/**
 * arcsift's image plane (x, y in arcsec from the image centre, x with the column, y with the row;
 * angles counter-clockwise from +x) against the sky of the image's celestial WCS: RA/Dec of a
 * position and back, position angles east of north and back. x and y are offsets along the pixel
 * axes, so with a rotated or mirrored WCS they are not offsets east and north.
 */
export class ImagePlaneSky {
  readonly wcs: CelestialWcs;
  private readonly grid: SkyGrid;

  constructor(grid: SkyGrid, wcs: CelestialWcsDescription) {
    this.grid = grid;
    this.wcs = new CelestialWcs(wcs);
  }

  /** The mapping for a data set, or undefined when its image has no celestial WCS. */
  static of(grid: SkyGrid): ImagePlaneSky | undefined {
    return grid.wcs === undefined ? undefined : new ImagePlaneSky(grid, grid.wcs);
  }

  /** The frame of the coordinates (RADESYS), e.g. ICRS. */
  get frame(): string {
    return this.wcs.description.frame;
  }

  private column(xArcsec: number): number {
    return xArcsec / this.grid.pixelScaleArcsec + (this.grid.columns - 1) / 2;
  }

  private row(yArcsec: number): number {
    return yArcsec / this.grid.pixelScaleArcsec + (this.grid.rows - 1) / 2;
  }

  /** RA/Dec of the image-plane position (x, y), arcsec from the image centre. */
  skyOf(xArcsec: number, yArcsec: number): SkyPosition {
    return this.wcs.pixelToSky(this.column(xArcsec), this.row(yArcsec));
  }

  /** The image-plane position (x, y) in arcsec of a sky position. */
  positionOf(raDeg: number, decDeg: number): { readonly xArcsec: number; readonly yArcsec: number } {
    const { column, row } = this.wcs.skyToPixel(raDeg, decDeg);
    return {
      xArcsec: (column - (this.grid.columns - 1) / 2) * this.grid.pixelScaleArcsec,
      yArcsec: (row - (this.grid.rows - 1) / 2) * this.grid.pixelScaleArcsec,
    };
  }

  /** A position angle counter-clockwise from +x at (x, y) (default the image centre) as one east of north, in [0, 360). */
  eastOfNorthDeg(counterClockwiseFromXDeg: number, xArcsec = 0, yArcsec = 0): number {
    return this.wcs.eastOfNorthDeg(counterClockwiseFromXDeg, this.column(xArcsec), this.row(yArcsec));
  }

  /**
   * A posterior summary of a position angle counter-clockwise from +x (median and 68% and 95%
   * intervals) as the same east of north at the image centre. The map is monotonic (increasing,
   * or decreasing for an image whose WCS is not mirrored), so quantiles map onto quantiles; a
   * decreasing map swaps the bounds. The median lies in [0, 360) and the bounds are unwrapped
   * about it, so an interval may run below 0 or above 360.
   */
  eastOfNorthSummary(summary: AngleSummary): AngleSummary {
    const median = this.eastOfNorthDeg(summary.median);
    const near = (angleCcw: number): number => {
      const eastOfNorth = this.eastOfNorthDeg(angleCcw);
      return median + ((((eastOfNorth - median) % 360) + 540) % 360) - 180;
    };
    const interval = ([lower, upper]: readonly [number, number]): [number, number] => {
      const a = near(lower);
      const b = near(upper);
      return a <= b ? [a, b] : [b, a];
    };
    return { median, interval68: interval(summary.interval68), interval95: interval(summary.interval95) };
  }

  /** A position angle east of north at (x, y) (default the image centre) as one counter-clockwise from +x, in [0, 360). */
  counterClockwiseFromXDeg(eastOfNorthDeg: number, xArcsec = 0, yArcsec = 0): number {
    return this.wcs.counterClockwiseFromXDeg(eastOfNorthDeg, this.column(xArcsec), this.row(yArcsec));
  }
}
