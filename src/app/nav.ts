import type { Role } from '@shared/schemas/auth.schema';
import { generatePath } from 'react-router';
import type { IconName } from '@/components/ui/icon-paths';
import { farmPattern, type FarmScreen } from '@/config/paths';

/**
 * The navigation registry: every farm screen a role may reach. Only `ready: true` entries are shown,
 * so a screen appears in the menus the day its route exists. Order here is the order in the menus.
 * The label is the i18n key `nav.<key>`.
 */
export type NavKey = Exclude<FarmScreen, 'unit'>;

export interface NavEntry {
  key: NavKey;
  /** Route pattern, with :farmId. */
  path: string;
  roles: readonly Role[];
  ready: boolean;
  icon: IconName;
}

const everyone: readonly Role[] = ['hand', 'manager', 'planner', 'admin'];
const office: readonly Role[] = ['manager', 'admin'];

function entry(key: NavKey, roles: readonly Role[], ready: boolean, icon: IconName): NavEntry {
  return { key, path: farmPattern(key), roles, ready, icon };
}

export const navRegistry: readonly NavEntry[] = [
  entry('home', everyone, true, 'home'),
  entry('tasks', ['hand'], true, 'tasks'),
  entry('pondside', ['hand'], true, 'tube'),
  entry('nightRound', ['hand'], true, 'moon'),
  entry('map', office, true, 'map'),
  entry('alerts', ['hand', 'manager', 'admin'], true, 'bell'),
  entry('treatments', ['hand'], true, 'drop'),
  entry('observations', ['hand'], true, 'eye'),
  entry('morningReport', office, true, 'report'),
  entry('units', office, true, 'grid'),
  entry('rations', ['planner'], true, 'scoop'),
  entry('stock', ['planner'], true, 'fish'),
  entry('imports', ['planner'], true, 'upload'),
  entry('records', ['manager', 'planner', 'admin'], true, 'chart'),
  entry('audit', office, true, 'shield'),
  entry('setup', office, true, 'sliders'),
  entry('people', ['admin'], true, 'people'),
  entry('outbox', office, true, 'mail'),
];

/** Every screen planned for a role, built or not (the home screen lists them). */
export function plannedFor(role: Role, registry: readonly NavEntry[] = navRegistry): NavEntry[] {
  return registry.filter((e) => e.roles.includes(role));
}

/** What the navigation shows a role: its screens that exist. */
export function navFor(role: Role, registry: readonly NavEntry[] = navRegistry): NavEntry[] {
  return plannedFor(role, registry).filter((e) => e.ready);
}

export function navHref(entry: NavEntry, farmId: string): string {
  return generatePath(entry.path, { farmId });
}

/** Where each role lands after sign-in: the first of these that is ready. */
export const roleLanding: Record<Role, readonly NavKey[]> = {
  hand: ['tasks', 'home'],
  manager: ['map', 'home'],
  planner: ['rations', 'home'],
  admin: ['map', 'home'],
};

export function homePathFor(role: Role, farmId: string, registry: readonly NavEntry[] = navRegistry): string {
  const ready = navFor(role, registry);
  for (const key of roleLanding[role]) {
    const hit = ready.find((e) => e.key === key);
    if (hit) return navHref(hit, farmId);
  }
  return navHref(ready[0] ?? entry('home', everyone, true, 'home'), farmId);
}

/** Phone tab bar: all entries if they fit, else the first (max − 1) plus a "more" list. */
export function splitForTabBar(entries: readonly NavEntry[], max = 5): { tabs: NavEntry[]; more: NavEntry[] } {
  if (entries.length <= max) return { tabs: [...entries], more: [] };
  return { tabs: entries.slice(0, max - 1), more: entries.slice(max - 1) };
}
