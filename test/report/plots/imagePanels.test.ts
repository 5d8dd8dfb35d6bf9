import { PNG } from 'pngjs';
import { describe, expect, it } from 'vitest';
import { divergingColourMap } from '../../../src/report/colour/divergingColourMap.js';
import { imagePanelSvg } from '../../../src/report/plots/imagePanelSvg.js';
import { imagePng } from '../../../src/report/plots/imagePng.js';
import { maskOutline } from '../../../src/report/plots/maskOutline.js';
import { niceTicks } from '../../../src/report/plots/niceTicks.js';
import { sequentialColourMap } from '../../../src/report/colour/sequentialColourMap.js';

const rgbAt = (png: PNG, x: number, y: number): number[] => Array.from(png.data.subarray(4 * (y * png.width + x), 4 * (y * png.width + x) + 3));
const mapEnd = (map: typeof sequentialColourMap, k: number): number[] => Array.from(map.bytes.subarray(3 * k, 3 * k + 3));

describe('imagePng', () => {
  it('puts image row 0 at the bottom of the picture and column 0 at the left', () => {
    // arcsift's convention (DEVELOPERS.md): index i + columns * j is column i of row j, row 0 at the
    // bottom, y up. PNG stores scanlines top first (PNG specification, W3C 2003, sec. 7.2), so row
    // 0 must be the last scanline. Image 3 x 2, only (column 0, row 0) at the top of the range.
    const values = Float64Array.from([1, 0, 0, 0, 0, 0]);
    const png = PNG.sync.read(imagePng({ values, columns: 3, rows: 2, map: sequentialColourMap, low: 0, high: 1 }));
    expect([png.width, png.height]).toEqual([3, 2]);
    const light = mapEnd(sequentialColourMap, sequentialColourMap.size - 1);
    const dark = mapEnd(sequentialColourMap, 0);
    expect(rgbAt(png, 0, 1)).toEqual(light);
    for (const [x, y] of [[0, 0], [1, 0], [2, 0], [1, 1], [2, 1]]) expect(rgbAt(png, x, y)).toEqual(dark);
  });

  it('repeats each pixel as an upscale x upscale block', () => {
    const values = Float64Array.from([0, 1]);
    const png = PNG.sync.read(imagePng({ values, columns: 2, rows: 1, map: sequentialColourMap, low: 0, high: 1, upscale: 3 }));
    expect([png.width, png.height]).toEqual([6, 3]);
    for (let y = 0; y < 3; y++) {
      for (let x = 0; x < 6; x++) expect(rgbAt(png, x, y)).toEqual(mapEnd(sequentialColourMap, x < 3 ? 0 : sequentialColourMap.size - 1));
    }
  });

  it('clips values beyond the range to the ends, paints hidden and NaN pixels apart, and centres a symmetric range', () => {
    const values = Float64Array.from([-5, 5, 0, NaN, 0.3]);
    const hidden = Uint8Array.from([0, 0, 0, 0, 1]);
    const png = PNG.sync.read(imagePng({ values, columns: 5, rows: 1, map: divergingColourMap, low: -1, high: 1, hidden, hiddenColour: [1, 2, 3] }));
    expect(rgbAt(png, 0, 0)).toEqual(mapEnd(divergingColourMap, 0));
    expect(rgbAt(png, 1, 0)).toEqual(mapEnd(divergingColourMap, divergingColourMap.size - 1));
    expect(rgbAt(png, 2, 0)).toEqual(mapEnd(divergingColourMap, (divergingColourMap.size - 1) / 2));
    expect(rgbAt(png, 3, 0)).toEqual([1, 2, 3]);
    expect(rgbAt(png, 4, 0)).toEqual([1, 2, 3]);
  });
});

describe('maskOutline', () => {
  it('draws the perimeter of the used pixels along pixel edges', () => {
    // One used pixel: its 4 sides. An L of three pixels: perimeter 8 unit edges (counted by hand).
    expect(maskOutline([1], 1, 1).length / 4).toBe(4);
    const segments = maskOutline([1, 1, 1, 0], 2, 2);
    expect(segments.length / 4).toBe(8);
    // Every segment is one pixel edge long and lies on the integer lattice.
    for (let k = 0; k < segments.length; k += 4) {
      expect(Math.abs(segments[k] - segments[k + 2]) + Math.abs(segments[k + 1] - segments[k + 3])).toBe(1);
    }
  });
});

describe('niceTicks', () => {
  it('steps by 1, 2 or 5 times a power of ten and stays inside the range', () => {
    // Heckbert 1990 (Graphics Gems I, "Nice numbers for graph labels"): steps 1, 2, 5 x 10^k.
    expect(niceTicks(-1.92, 1.92, 5).values).toEqual([-1, 0, 1]);
    expect(niceTicks(8, 11.5, 5).values).toEqual([8, 9, 10, 11]);
    expect(niceTicks(0.187, 0.2185, 4).values.map((v) => v.toFixed(2))).toEqual(['0.19', '0.20', '0.21']);
  });
});

describe('imagePanelSvg', () => {
  it('embeds the PNG it is given and labels the axes in arcsec about the image centre', () => {
    const colouring = { values: new Float64Array(48 * 48), columns: 48, rows: 48, map: sequentialColourMap, low: 0, high: 1 };
    const png = imagePng(colouring);
    const svg = imagePanelSvg({ title: 'test', colouring, pixelScaleArcsec: 0.08, colourBarLabel: 'counts/s' }, png);
    expect(svg).toContain(`href="data:image/png;base64,${png.toString('base64')}"`);
    expect(svg).toContain('x [arcsec]');
    expect(svg).toContain('y [arcsec]');
    // 48 pixels of 0.08 arcsec span -1.92..1.92: ticks -1, 0, 1 on each axis (and none beyond the image).
    for (const label of ['-1', '0', '1']) expect(svg).toContain(`>${label}</text>`);
    expect(svg).not.toContain('>2</text>');
  });
});
