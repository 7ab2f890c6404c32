import { rationLiveEvents } from '@/features/rations/live';
import { registerLiveEvent, type LiveEventKeys } from '@/lib/live-events';

/**
 * Which live event makes which cached queries stale. Each feature exports its bindings from its api/
 * (e.g. `export const alertLiveEvents = { 'alert.opened': (e) => [alertQueries.all(e.farmId)] }`);
 * they are composed here because features never import each other.
 */
const featureBindings: Array<Record<string, LiveEventKeys>> = [
  // alertLiveEvents, unitLiveEvents, ... as features land
  rationLiveEvents,
];

let registered = false;

export function registerLiveBindings(): void {
  if (registered) return;
  registered = true;
  for (const bindings of featureBindings) {
    for (const [type, keys] of Object.entries(bindings)) registerLiveEvent(type, keys);
  }
}
