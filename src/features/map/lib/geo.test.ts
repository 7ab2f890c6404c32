import { describe, expect, it } from 'vitest';
import { boundsOf, centroid, padBounds } from './geo';

/** A rectangle like the demo seed draws: widthM × lengthM, south-west corner at (lon, lat). */
function rectangle(lon: number, lat: number, widthM: number, lengthM: number) {
  const mPerDegLon = 111_320 * Math.cos((lat * Math.PI) / 180);
  const pt = (e: number, n: number) => [Number((lon + e / mPerDegLon).toFixed(7)), Number((lat + n / 111_320).toFixed(7))];
  const ring = [pt(0, 0), pt(widthM, 0), pt(widthM, lengthM), pt(0, lengthM)];
  return { type: 'Polygon' as const, coordinates: [[...ring, ring[0]!]] };
}

describe('geo', () => {
  it('puts a 3 m × 30 m raceway’s centre in its middle, to within a few centimetres (computed)', () => {
    const lon = -91.02875;
    const lat = 33.26431;
    const c = centroid(rectangle(lon, lat, 3, 30))!;
    const mPerDegLon = 111_320 * Math.cos((lat * Math.PI) / 180);
    expect(Math.abs((c[0] - lon) * mPerDegLon - 1.5)).toBeLessThan(0.05);
    expect(Math.abs((c[1] - lat) * 111_320 - 15)).toBeLessThan(0.05);
  });

  it('bounds every outline and pads the box by metres', () => {
    const b = boundsOf([{ outline: rectangle(-91, 33, 100, 100) }, { outline: null }])!;
    const [[x0, y0]] = padBounds(b, 30);
    expect(b[0]).toEqual([-91, 33]);
    expect((33 - y0) * 111_320).toBeCloseTo(30, 0);
    expect(x0).toBeLessThan(-91);
  });
});
