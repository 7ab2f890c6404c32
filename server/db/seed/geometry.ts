import type { GeoJsonPolygon } from '../entities';

const M_PER_DEG_LAT = 111_320;

/** A rectangle of `widthM` × `lengthM` whose south-west corner is `eastM`/`northM` metres from the origin. */
export function rectangle(origin: { lon: number; lat: number }, eastM: number, northM: number, widthM: number, lengthM: number): GeoJsonPolygon {
  const mPerDegLon = M_PER_DEG_LAT * Math.cos((origin.lat * Math.PI) / 180);
  const pt = (e: number, n: number): number[] => [
    Number((origin.lon + e / mPerDegLon).toFixed(7)),
    Number((origin.lat + n / M_PER_DEG_LAT).toFixed(7)),
  ];
  const ring = [pt(eastM, northM), pt(eastM + widthM, northM), pt(eastM + widthM, northM + lengthM), pt(eastM, northM + lengthM)];
  return { type: 'Polygon', coordinates: [[...ring, ring[0] as number[]]] };
}
