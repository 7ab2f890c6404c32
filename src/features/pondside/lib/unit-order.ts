import type { Task } from '@shared/schemas/treatments.schema';
import type { UnitDto } from '@shared/schemas/units.schema';
import { distanceM, outlineCentroid, type LonLat } from './geo';

export interface OrderedUnit {
  unit: UnitDto;
  task: Task | null;
  /** Metres from the phone, when it shares its location and the unit has an outline. */
  distanceM: number | null;
}

/**
 * The order a hand sees units in: nearest first when the phone shares its location (distance to the
 * centre of each unit's outline); otherwise the hand's task order — overdue and due tests in walking
 * order, then the rest of the round. Fallow units go last.
 */
export function orderUnits(units: readonly UnitDto[], tasks: readonly Task[], position: LonLat | null): OrderedUnit[] {
  const taskOf = new Map(tasks.map((t) => [t.unitId, t]));
  const taskRank = new Map(tasks.map((t, i) => [t.unitId, i]));
  const rows = units.map((unit) => {
    const c = position ? outlineCentroid(unit.outline) : null;
    return { unit, task: taskOf.get(unit.id) ?? null, distanceM: c && position ? distanceM(position, c) : null };
  });
  const fallow = (r: OrderedUnit) => (r.unit.state === 'fallow' ? 1 : 0);
  return rows.sort((a, b) => {
    if (fallow(a) !== fallow(b)) return fallow(a) - fallow(b);
    if (position) {
      if (a.distanceM !== null && b.distanceM !== null && a.distanceM !== b.distanceM) return a.distanceM - b.distanceM;
      if ((a.distanceM === null) !== (b.distanceM === null)) return a.distanceM === null ? 1 : -1;
    }
    const ra = taskRank.get(a.unit.id) ?? Number.MAX_SAFE_INTEGER;
    const rb = taskRank.get(b.unit.id) ?? Number.MAX_SAFE_INTEGER;
    return ra - rb || a.unit.walkOrder - b.unit.walkOrder || a.unit.code.localeCompare(b.unit.code);
  });
}
