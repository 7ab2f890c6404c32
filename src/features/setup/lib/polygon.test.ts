import { createUnitRequestSchema } from '@shared/schemas/units.schema';
import { describe, expect, it } from 'vitest';
import { areaM2, cornersOf, parseCorners, polygonFrom } from './polygon';

describe('polygonFrom', () => {
  it('closes the ring so the shared unit schema accepts the outline', () => {
    const poly = polygonFrom([
      [-91, 33],
      [-90.999, 33],
      [-90.999, 33.001],
    ]);
    expect(poly?.coordinates[0]).toHaveLength(4);
    expect(poly?.coordinates[0]?.[0]).toEqual(poly?.coordinates[0]?.[3]);
    expect(createUnitRequestSchema.safeParse({ code: 'P9', name: 'New pond', kind: 'pond', outline: poly }).success).toBe(true);
  });

  it('needs three distinct corners', () => {
    expect(
      polygonFrom([
        [1, 1],
        [1, 1],
        [2, 2],
      ]),
    ).toBeNull();
  });

  it('gives back the corners it was made from', () => {
    const corners: Array<[number, number]> = [
      [-91, 33],
      [-90.999, 33],
      [-90.999, 33.001],
      [-91, 33.001],
    ];
    expect(cornersOf(polygonFrom(corners))).toEqual(corners);
  });
});

describe('areaM2', () => {
  it('a square of 0.001° at 33° N is about 111 m × 93 m (computed: 111.2 × 93.3 ≈ 10,370 m²)', () => {
    const a = areaM2([
      [-91, 33],
      [-90.999, 33],
      [-90.999, 33.001],
      [-91, 33.001],
    ]);
    expect(a).toBeGreaterThan(10_300);
    expect(a).toBeLessThan(10_450);
  });
});

describe('parseCorners', () => {
  it('reads "lon, lat" lines and refuses anything else', () => {
    expect(parseCorners('-91.1, 33.2\n-91.0 33.2\n')).toEqual([
      [-91.1, 33.2],
      [-91, 33.2],
    ]);
    expect(parseCorners('north corner')).toBeNull();
    expect(parseCorners('200, 10')).toBeNull();
  });
});
