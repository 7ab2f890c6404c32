import type { GeoJsonPolygon } from '../../db/entities';

/** WGS 84 equatorial radius, m (the sphere most web-map area tools use). */
const EARTH_RADIUS_M = 6_378_137;
const rad = (deg: number) => (deg * Math.PI) / 180;

/**
 * Area of a ring on the sphere, m² (unsigned): Chamberlain & Duquette (2007), "Some algorithms for
 * polygons on a sphere", JPL Publication 07-03 — Σ (λᵢ₊₁ − λᵢ₋₁)·sin φᵢ · R² / 2.
 */
export function ringAreaM2(ring: number[][]): number {
  // Drop the closing position; the sum wraps around itself.
  const pts =
    ring.length > 1 && ring[0]?.[0] === ring[ring.length - 1]?.[0] && ring[0]?.[1] === ring[ring.length - 1]?.[1]
      ? ring.slice(0, -1)
      : ring;
  const n = pts.length;
  if (n < 3) return 0;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const prev = pts[(i + n - 1) % n]!;
    const cur = pts[i]!;
    const next = pts[(i + 1) % n]!;
    sum += (rad(next[0]!) - rad(prev[0]!)) * Math.sin(rad(cur[1]!));
  }
  return Math.abs((sum * EARTH_RADIUS_M * EARTH_RADIUS_M) / 2);
}

/** Water surface of a polygon: the outer ring minus its holes, m², rounded to 0.1 m². */
export function polygonAreaM2(polygon: GeoJsonPolygon): number {
  const [outer, ...holes] = polygon.coordinates;
  if (!outer) return 0;
  const area = ringAreaM2(outer) - holes.reduce((sum, h) => sum + ringAreaM2(h), 0);
  return Math.round(Math.max(0, area) * 10) / 10;
}
