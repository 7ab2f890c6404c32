import { matchRoutes } from 'react-router';
import { describe, expect, it } from 'vitest';
import { farmPath } from '@/config/paths';
import { homePathFor, navFor, navHref, navRegistry, plannedFor, splitForTabBar, type NavEntry } from './nav';
import { appRoutes } from './router';

const sample: NavEntry[] = [
  { key: 'home', path: '/farms/:farmId', roles: ['hand', 'manager', 'planner', 'admin'], ready: true, icon: 'home' },
  { key: 'tasks', path: '/farms/:farmId/tasks', roles: ['hand'], ready: true, icon: 'tasks' },
  { key: 'pondside', path: '/farms/:farmId/pondside-test', roles: ['hand'], ready: false, icon: 'tube' },
  { key: 'map', path: '/farms/:farmId/map', roles: ['manager', 'admin'], ready: true, icon: 'map' },
  { key: 'rations', path: '/farms/:farmId/rations', roles: ['planner'], ready: true, icon: 'scoop' },
  { key: 'people', path: '/farms/:farmId/setup/people', roles: ['admin'], ready: true, icon: 'people' },
];

describe('nav registry', () => {
  it('shows a role only the ready screens that list that role', () => {
    expect(navFor('hand', sample).map((e) => e.key)).toEqual(['home', 'tasks']);
    expect(navFor('manager', sample).map((e) => e.key)).toEqual(['home', 'map']);
    expect(navFor('planner', sample).map((e) => e.key)).toEqual(['home', 'rations']);
    expect(navFor('admin', sample).map((e) => e.key)).toEqual(['home', 'map', 'people']);
  });

  it('keeps screens that are not built yet out of the navigation but in the plan', () => {
    expect(navFor('hand', sample).some((e) => e.key === 'pondside')).toBe(false);
    expect(plannedFor('hand', sample).some((e) => e.key === 'pondside')).toBe(true);
  });

  it('lands each role on its first ready landing screen', () => {
    expect(homePathFor('hand', 'f1', sample)).toBe('/farms/f1/tasks');
    expect(homePathFor('manager', 'f1', sample)).toBe('/farms/f1/map');
    expect(homePathFor('planner', 'f1', sample)).toBe('/farms/f1/rations');
    const notYet = sample.map((e) => (e.key === 'tasks' ? { ...e, ready: false } : e));
    expect(homePathFor('hand', 'f1', notYet)).toBe('/farms/f1');
  });

  it('gives the role lists of the brief', () => {
    const keys = (role: Parameters<typeof plannedFor>[0]) => plannedFor(role).map((e) => e.key);
    expect(keys('hand')).toEqual(['home', 'tasks', 'pondside', 'nightRound', 'alerts', 'treatments', 'observations']);
    expect(keys('manager')).toEqual(['home', 'map', 'alerts', 'morningReport', 'units', 'records', 'audit', 'setup', 'outbox']);
    expect(keys('planner')).toEqual(['home', 'rations', 'stock', 'imports', 'records']);
    for (const k of keys('manager')) expect(keys('admin')).toContain(k);
    expect(keys('admin')).toContain('people');
  });

  it('has a route for every ready entry (so no menu item leads to "not found")', () => {
    for (const entry of navRegistry.filter((e) => e.ready)) {
      const href = navHref(entry, 'f1');
      const matches = matchRoutes(appRoutes, href) ?? [];
      const leaf = matches[matches.length - 1]?.route;
      expect(leaf, href).toBeDefined();
      expect(leaf?.path, `${href} falls through to the catch-all`).not.toBe('*');
    }
  });

  it('builds links with the farm id', () => {
    expect(navHref(sample[1]!, 'abc')).toBe('/farms/abc/tasks');
    expect(farmPath('unit', 'abc', { unitId: 'u9' })).toBe('/farms/abc/units/u9');
  });

  it('puts at most the given number of tabs on the phone bar and the rest under "more"', () => {
    const many = navRegistry.filter((e) => e.roles.includes('manager'));
    const { tabs, more } = splitForTabBar(many, 4);
    expect(tabs).toHaveLength(3);
    expect(more).toHaveLength(many.length - 3);
    expect(splitForTabBar(many.slice(0, 4), 4)).toEqual({ tabs: many.slice(0, 4), more: [] });
  });
});
