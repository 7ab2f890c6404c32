import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { mapStatusOf, type MapStatus } from './palette';

export type LngLat = [number, number];
export type Bounds = [LngLat, LngLat];

type Polygon = NonNullable<UnitStatusDto['outline']>;

function outerRing(outline: Polygon): LngLat[] {
  return (outline.coordinates[0] ?? []).filter((p) => p.length >= 2).map((p) => [p[0]!, p[1]!] as LngLat);
}

/**
 * Area-weighted centroid of the outer ring (the vertex mean for degenerate rings). Computed relative
 * to the first corner: with raw longitudes (≈ −91) the shoelace sums cancel so badly that a
 * 3 m raceway's centre lands tens of metres off.
 */
export function centroid(outline: Polygon): LngLat | null {
  const ring = outerRing(outline);
  if (ring.length === 0) return null;
  const [ox, oy] = ring[0]!;
  let a = 0;
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < ring.length - 1; i++) {
    const x0 = ring[i]![0] - ox;
    const y0 = ring[i]![1] - oy;
    const x1 = ring[i + 1]![0] - ox;
    const y1 = ring[i + 1]![1] - oy;
    const f = x0 * y1 - x1 * y0;
    a += f;
    cx += (x0 + x1) * f;
    cy += (y0 + y1) * f;
  }
  if (Math.abs(a) < 1e-24) {
    const n = ring.length;
    return [ring.reduce((s, p) => s + p[0], 0) / n, ring.reduce((s, p) => s + p[1], 0) / n];
  }
  return [ox + cx / (3 * a), oy + cy / (3 * a)];
}

/** The box around every outline; null when no unit has one. */
export function boundsOf(units: readonly Pick<UnitStatusDto, 'outline'>[]): Bounds | null {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const u of units) {
    if (!u.outline) continue;
    for (const [x, y] of outerRing(u.outline)) {
      minX = Math.min(minX, x);
      minY = Math.min(minY, y);
      maxX = Math.max(maxX, x);
      maxY = Math.max(maxY, y);
    }
  }
  if (!Number.isFinite(minX)) return null;
  return [
    [minX, minY],
    [maxX, maxY],
  ];
}

/** The bounds grown by `metres` on every side (the farm ground drawn under the units). */
export function padBounds([[minX, minY], [maxX, maxY]]: Bounds, metres: number): Bounds {
  const dLat = metres / 111_320;
  const dLon = metres / (111_320 * Math.cos((((minY + maxY) / 2) * Math.PI) / 180));
  return [
    [minX - dLon, minY - dLat],
    [maxX + dLon, maxY + dLat],
  ];
}

export interface UnitFeatureProps {
  id: string;
  code: string;
  status: MapStatus;
  selected: boolean;
}

export interface ProbePoint {
  id: string;
  unitId: string | null;
  label: string;
  /** ok | attention | silent | maintenance | inactive (the probe's health state). */
  health: string;
}

export function unitFeatures(units: readonly UnitStatusDto[], selectedId: string | null) {
  return {
    type: 'FeatureCollection' as const,
    features: units
      .filter((u) => u.outline)
      .map((u) => ({
        type: 'Feature' as const,
        id: u.id,
        properties: { id: u.id, code: u.code, status: mapStatusOf(u.status), selected: u.id === selectedId } satisfies UnitFeatureProps,
        geometry: { type: 'Polygon' as const, coordinates: u.outline!.coordinates },
      })),
  };
}

/**
 * Probes carry no position of their own, so each is drawn inside its unit: towards a corner of the
 * outline (the first probe towards the first corner, the next towards the opposite one).
 */
export function probeFeatures(units: readonly UnitStatusDto[], probes: readonly ProbePoint[]) {
  const byUnit = new Map(units.map((u) => [u.id, u]));
  const seen = new Map<string, number>();
  const features = [];
  for (const p of probes) {
    const unit = p.unitId ? byUnit.get(p.unitId) : undefined;
    if (!unit?.outline) continue;
    const c = centroid(unit.outline);
    const ring = outerRing(unit.outline);
    if (!c || ring.length < 4) continue;
    const n = seen.get(unit.id) ?? 0;
    seen.set(unit.id, n + 1);
    const corner = ring[(n * 2) % (ring.length - 1)]!;
    const at: LngLat = [c[0] + 0.62 * (corner[0] - c[0]), c[1] + 0.62 * (corner[1] - c[1])];
    features.push({
      type: 'Feature' as const,
      properties: { id: p.id, unitId: unit.id, health: p.health },
      geometry: { type: 'Point' as const, coordinates: at },
    });
  }
  return { type: 'FeatureCollection' as const, features };
}

export function farmGroundFeature(bounds: Bounds | null) {
  if (!bounds) return { type: 'FeatureCollection' as const, features: [] };
  const [[x0, y0], [x1, y1]] = padBounds(bounds, 30);
  return {
    type: 'FeatureCollection' as const,
    features: [
      {
        type: 'Feature' as const,
        properties: {},
        geometry: {
          type: 'Polygon' as const,
          coordinates: [
            [
              [x0, y0],
              [x1, y0],
              [x1, y1],
              [x0, y1],
              [x0, y0],
            ],
          ],
        },
      },
    ],
  };
}
