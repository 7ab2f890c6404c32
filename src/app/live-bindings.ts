import { alertLiveEvents } from '@/features/alerts/live';
import { mapLiveEvents } from '@/features/map/live';
import { reportLiveEvents } from '@/features/reports/live';
import { unitLiveEvents } from '@/features/units/live';
import { rationLiveEvents } from '@/features/rations/live';
import { nightRoundLiveEvents } from '@/features/night-round/api/night-round';
import { observationLiveEvents } from '@/features/observations/api/observations';
import { pondsideLiveEvents } from '@/features/pondside/api/live';
import { taskLiveEvents } from '@/features/tasks/api/tasks';
import { treatmentLiveEvents } from '@/features/treatments/api/treatments';
import { stockLiveEvents } from '@/features/stock/live';
import { registerLiveEvent, type LiveEventKeys } from '@/lib/live-events';

/**
 * Which live event makes which cached queries stale. Each feature exports its bindings from its api/
 * (e.g. `export const alertLiveEvents = { 'alert.opened': (e) => [alertQueries.all(e.farmId)] }`);
 * they are composed here because features never import each other.
 */
const featureBindings: Array<Record<string, LiveEventKeys>> = [
  mapLiveEvents,
  unitLiveEvents,
  alertLiveEvents,
  reportLiveEvents,
  rationLiveEvents,
  pondsideLiveEvents,
  taskLiveEvents,
  nightRoundLiveEvents,
  treatmentLiveEvents,
  observationLiveEvents,
  stockLiveEvents,
];

let registered = false;

export function registerLiveBindings(): void {
  if (registered) return;
  registered = true;
  for (const bindings of featureBindings) {
    for (const [type, keys] of Object.entries(bindings)) registerLiveEvent(type, keys);
  }
}
