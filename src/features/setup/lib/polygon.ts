// Plain geometry for the outline editor: the drawn corners (an open list of [lon, lat]) and the
// GeoJSON Polygon the API takes (one closed outer ring).

export type LngLat = [number, number];
export interface Polygon {
  type: 'Polygon';
  coordinates: number[][][];
}

/** A closed GeoJSON Polygon from the corners, or null with fewer than 3 distinct corners. */
export function polygonFrom(corners: readonly LngLat[]): Polygon | null {
  const distinct = corners.filter((p, i) => i === 0 || p[0] !== corners[i - 1]![0] || p[1] !== corners[i - 1]![1]);
  if (new Set(distinct.map((p) => `${p[0]},${p[1]}`)).size < 3) return null;
  const ring = distinct.map((p) => [round(p[0]), round(p[1])]);
  const first = ring[0]!;
  const last = ring[ring.length - 1]!;
  if (first[0] !== last[0] || first[1] !== last[1]) ring.push([first[0]!, first[1]!]);
  return { type: 'Polygon', coordinates: [ring] };
}

/** The corners of an outline (its outer ring without the closing position). */
export function cornersOf(outline: Polygon | null | undefined): LngLat[] {
  const ring = outline?.coordinates[0] ?? [];
  const pts = ring.filter((p) => p.length >= 2).map((p) => [p[0]!, p[1]!] as LngLat);
  if (pts.length > 1) {
    const a = pts[0]!;
    const b = pts[pts.length - 1]!;
    if (a[0] === b[0] && a[1] === b[1]) pts.pop();
  }
  return pts;
}

/** 1e-7° is about 1 cm: enough for a pond edge, short enough for the payload. */
function round(v: number): number {
  return Math.round(v * 1e7) / 1e7;
}

const EARTH_RADIUS_M = 6_371_008.8;

/**
 * Area of the corners' polygon in m² on a local equirectangular projection around its mean latitude
 * (computed; good to well under 1 % for a farm-sized outline).
 */
export function areaM2(corners: readonly LngLat[]): number {
  if (corners.length < 3) return 0;
  const lat0 = (corners.reduce((s, p) => s + p[1], 0) / corners.length) * (Math.PI / 180);
  const k = (Math.PI / 180) * EARTH_RADIUS_M;
  const xy = corners.map(([lon, lat]) => [lon * k * Math.cos(lat0), lat * k] as const);
  let twice = 0;
  for (let i = 0; i < xy.length; i++) {
    const [x0, y0] = xy[i]!;
    const [x1, y1] = xy[(i + 1) % xy.length]!;
    twice += x0 * y1 - x1 * y0;
  }
  return Math.abs(twice) / 2;
}

/** The box around a set of corners, or null for none. */
export function boundsOfCorners(corners: readonly LngLat[]): [LngLat, LngLat] | null {
  if (corners.length === 0) return null;
  let minX = Infinity,
    minY = Infinity,
    maxX = -Infinity,
    maxY = -Infinity;
  for (const [x, y] of corners) {
    minX = Math.min(minX, x);
    minY = Math.min(minY, y);
    maxX = Math.max(maxX, x);
    maxY = Math.max(maxY, y);
  }
  return [
    [minX, minY],
    [maxX, maxY],
  ];
}

/** "lon, lat" per line (the keyboard way to give an outline) → corners; null when a line is not a position. */
export function parseCorners(text: string): LngLat[] | null {
  const lines = text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean);
  const out: LngLat[] = [];
  for (const line of lines) {
    const m = /^(-?\d+(?:\.\d+)?)\s*[,;\s]\s*(-?\d+(?:\.\d+)?)$/.exec(line);
    if (!m) return null;
    const lon = Number(m[1]);
    const lat = Number(m[2]);
    if (!(lon >= -180 && lon <= 180 && lat >= -90 && lat <= 90)) return null;
    out.push([lon, lat]);
  }
  return out;
}

export function formatCorners(corners: readonly LngLat[]): string {
  return corners.map(([lon, lat]) => `${lon.toFixed(6)}, ${lat.toFixed(6)}`).join('\n');
}

/** The mean of the corners (where a unit's code label goes). */
export function centroidOf(corners: readonly LngLat[]): LngLat | null {
  if (corners.length === 0) return null;
  return [corners.reduce((s, p) => s + p[0], 0) / corners.length, corners.reduce((s, p) => s + p[1], 0) / corners.length];
}
