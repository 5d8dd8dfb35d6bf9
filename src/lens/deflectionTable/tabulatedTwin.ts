import type { MassProfile } from '../massProfile.js';
import {
  EllipticalDeflectionTable, addTabulatedDeflection, type TableAxis, type TableCall,
} from './ellipticalDeflectionTable.js';

/** Calls with fewer points use the reference rather than wait for missing node slices (50-100 ms each). */
const TABLE_MINIMUM_POINTS = 256;
const DEG = Math.PI / 180;

/** How a profile's parameters map onto the table (indices into its parameter list). */
export interface TwinLayout {
  /** The parameter interpolated along the table's shape axis, and that axis. */
  readonly shape?: { readonly index: number; readonly axis: TableAxis };
  /** A parameter that selects a table of its own (held exactly, e.g. a Sersic index). */
  readonly keyIndex?: number;
  /** Radii (in units of the radius scale) the table spans, for a key value. */
  readonly radiusRange: (key: number) => readonly [number, number];
}

/**
 * The fast twin of an elliptical profile whose parameters start with an amplitude and a radius
 * scale and include axisRatio, positionAngleDeg, centerXArcsec and centerYArcsec: the deflection
 * comes from an EllipticalDeflectionTable filled by the reference itself, and from the reference
 * where the table does not reach (points outside its radius range, q below 0.2, a shape outside
 * its axis, a key seen for the first time in a row: a fit that samples the key never builds
 * tables for it, one that holds it builds them from its second call, and calls of fewer than
 * TABLE_MINIMUM_POINTS points that would need new node slices). Convergence and spherical mass are
 * the reference's.
 */
export function tabulatedTwin(reference: MassProfile, layout: TwinLayout): MassProfile {
  const names = reference.parameterNames;
  const qIndex = names.indexOf('axisRatio'), angleIndex = names.indexOf('positionAngleDeg');
  const xIndex = names.indexOf('centerXArcsec'), yIndex = names.indexOf('centerYArcsec');
  const unit = new Float64Array(names.length);
  const tables = new Map<number, EllipticalDeflectionTable>();
  // A profile without a key has one table, built on first use.
  let lastKey = layout.keyIndex === undefined ? 0 : Number.NaN;
  const call: TableCall = { amplitude: 0, inverseRadius: 0, q: 1, cos: 1, sin: 0, cx: 0, cy: 0 };
  const scratch = { outside: new Int32Array(4096), x: new Float64Array(64), y: new Float64Array(64), ax: new Float64Array(64), ay: new Float64Array(64) };

  const tableFor = (key: number): EllipticalDeflectionTable | undefined => {
    let table = tables.get(key);
    if (table === undefined && key === lastKey) {
      const [minRadius, maxRadius] = layout.radiusRange(key);
      const unitDeflection = (q: number, shape: number, x: Float64Array, y: Float64Array, n: number, ax: Float64Array, ay: Float64Array): void => {
        unit.fill(0);
        unit[0] = 1;
        unit[1] = 1;
        unit[qIndex] = q;
        if (layout.shape !== undefined) unit[layout.shape.index] = shape;
        if (layout.keyIndex !== undefined) unit[layout.keyIndex] = key;
        reference.addDeflection(unit, 0, x, y, n, ax, ay);
      };
      table = new EllipticalDeflectionTable(unitDeflection, minRadius, maxRadius, layout.shape?.axis);
      tables.set(key, table);
    }
    lastKey = key;
    return table;
  };

  // The points the table left out, deflected by the reference in one call.
  const addOutside = (p: Float64Array, offset: number, x: Float64Array, y: Float64Array, count: number, alphaX: Float64Array, alphaY: Float64Array): void => {
    if (scratch.x.length < count) {
      scratch.x = new Float64Array(count); scratch.y = new Float64Array(count);
      scratch.ax = new Float64Array(count); scratch.ay = new Float64Array(count);
    }
    for (let k = 0; k < count; k++) {
      scratch.x[k] = x[scratch.outside[k]];
      scratch.y[k] = y[scratch.outside[k]];
    }
    scratch.ax.fill(0, 0, count);
    scratch.ay.fill(0, 0, count);
    reference.addDeflection(p, offset, scratch.x, scratch.y, count, scratch.ax, scratch.ay);
    for (let k = 0; k < count; k++) {
      alphaX[scratch.outside[k]] += scratch.ax[k];
      alphaY[scratch.outside[k]] += scratch.ay[k];
    }
  };

  return {
    kind: reference.kind,
    parameterNames: names,
    addConvergence: reference.addConvergence,
    ...(reference.sphericalMassWithin === undefined ? {} : { sphericalMassWithin: reference.sphericalMassWithin }),
    addDeflection(p, offset, x, y, n, alphaX, alphaY) {
      const q = p[offset + qIndex];
      const shape = layout.shape === undefined ? 0 : p[offset + layout.shape.index];
      const table = tableFor(layout.keyIndex === undefined ? 0 : p[offset + layout.keyIndex]);
      if (table === undefined || !table.covers(q, shape) || (n < TABLE_MINIMUM_POINTS && !table.isReady(q, shape))) {
        reference.addDeflection(p, offset, x, y, n, alphaX, alphaY);
        return;
      }
      table.prepare(q, shape);
      const angle = p[offset + angleIndex] * DEG;
      call.amplitude = p[offset];
      call.inverseRadius = 1 / p[offset + 1];
      call.q = q;
      call.cos = Math.cos(angle);
      call.sin = Math.sin(angle);
      call.cx = p[offset + xIndex];
      call.cy = p[offset + yIndex];
      if (scratch.outside.length < n) scratch.outside = new Int32Array(n);
      const outsideCount = addTabulatedDeflection(table, call, x, y, n, alphaX, alphaY, scratch.outside);
      if (outsideCount > 0) addOutside(p, offset, x, y, outsideCount, alphaX, alphaY);
    },
  };
}
