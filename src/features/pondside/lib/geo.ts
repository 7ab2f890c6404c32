/** A point on the farm, WGS 84. */
export interface LonLat {
  lon: number;
  lat: number;
}

type Polygon = { type: 'Polygon'; coordinates: number[][][] };

/**
 * Centroid of a unit's outline (outer ring), by the shoelace formula on lon/lat — at farm scale the
 * distortion of treating degrees as a plane is far below the size of a pond. Falls back to the mean
 * of the corners for a degenerate ring.
 */
export function outlineCentroid(outline: Polygon | null | undefined): LonLat | null {
  const ring = outline?.coordinates[0];
  if (!ring || ring.length < 4) return null;
  const pts = ring.slice(0, -1).filter((p): p is [number, number] => p.length >= 2);
  if (pts.length < 3) return null;
  let area = 0;
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < pts.length; i++) {
    const [x0, y0] = pts[i]!;
    const [x1, y1] = pts[(i + 1) % pts.length]!;
    const cross = x0 * y1 - x1 * y0;
    area += cross;
    cx += (x0 + x1) * cross;
    cy += (y0 + y1) * cross;
  }
  if (Math.abs(area) < 1e-18) {
    return { lon: pts.reduce((s, p) => s + p[0], 0) / pts.length, lat: pts.reduce((s, p) => s + p[1], 0) / pts.length };
  }
  return { lon: cx / (3 * area), lat: cy / (3 * area) };
}

const EARTH_RADIUS_M = 6_371_008.8;

/** Great-circle distance in metres (haversine, mean Earth radius). */
export function distanceM(a: LonLat, b: LonLat): number {
  const rad = Math.PI / 180;
  const dLat = (b.lat - a.lat) * rad;
  const dLon = (b.lon - a.lon) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a.lat * rad) * Math.cos(b.lat * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * EARTH_RADIUS_M * Math.asin(Math.min(1, Math.sqrt(h)));
}
