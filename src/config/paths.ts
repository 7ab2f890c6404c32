import { generatePath } from 'react-router';

/**
 * Every route path of the client, in one place.
 * Farm screens live under /farms/:farmId/<segment>; `farmScreens` holds the segment of each.
 */
export const farmScreens = {
  home: '',
  map: 'map',
  units: 'units',
  unit: 'units/:unitId',
  tasks: 'tasks',
  pondside: 'test',
  unitTest: 'units/:unitId/test',
  unitLabel: 'units/:unitId/label',
  nightRound: 'night-round',
  treatments: 'treatments',
  observations: 'observations',
  alerts: 'alerts',
  morningReport: 'morning-report',
  rations: 'rations',
  stock: 'stock',
  imports: 'imports',
  records: 'records',
  audit: 'audit',
  setup: 'setup',
  people: 'setup/people',
  outbox: 'outbox',
} as const;

export type FarmScreen = keyof typeof farmScreens;

export const paths = {
  root: '/',
  signIn: '/sign-in',
  forgotPassword: '/forgot-password',
  resetPassword: '/reset-password',
  farm: '/farms/:farmId',
} as const;

/** Full pattern of a farm screen, e.g. `/farms/:farmId/tasks`. */
export function farmPattern(screen: FarmScreen): string {
  const segment = farmScreens[screen];
  return segment ? `${paths.farm}/${segment}` : paths.farm;
}

/** Concrete URL of a farm screen, e.g. farmPath('unit', farmId, { unitId }). */
export function farmPath(
  screen: FarmScreen,
  farmId: string,
  params: Record<string, string> = {},
): string {
  return generatePath(farmPattern(screen), { ...params, farmId });
}

/** Only same-site absolute paths are accepted as a post-sign-in target. */
export function safeNext(next: string | null | undefined): string | null {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return null;
  if (next.startsWith(paths.signIn)) return null;
  return next;
}

export function signInPath(next?: string | null): string {
  const target = safeNext(next);
  return target && target !== paths.root ? `${paths.signIn}?next=${encodeURIComponent(target)}` : paths.signIn;
}
