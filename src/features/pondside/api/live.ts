import type { LiveEventKeys } from '@/lib/live-events';
import { pondsideQueries } from './farm-data';
import { waterTestQueries } from './water-tests';

/** Live events that make the pondside screens' data stale (composed in src/app/live-bindings.ts). */
export const pondsideLiveEvents: Record<string, LiveEventKeys> = {
  result: (e) => [waterTestQueries.all(e.farmId), [...pondsideQueries.all(e.farmId), 'status']],
  status: (e) => [[...pondsideQueries.all(e.farmId), 'status']],
  task: (e) => [[...pondsideQueries.all(e.farmId), 'tasks']],
};
