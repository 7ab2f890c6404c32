import { useState, type ComponentType } from 'react';
import { createBrowserRouter, RouterProvider, type RouteObject } from 'react-router';
import { farmScreens, paths } from '@/config/paths';
import { BootFallback, RootLayout, RouteError } from './root-layout';

type RouteModule = { default: ComponentType };

/** Route modules default-export their component; each becomes its own chunk. */
export function lazyRoute(load: () => Promise<RouteModule>): () => Promise<{ Component: ComponentType }> {
  return async () => ({ Component: (await load()).default });
}

/**
 * Screens under /farms/:farmId. To add one:
 *   1. src/app/routes/<screen>.tsx with a default export (it composes the feature's components);
 *   2. a line here: { path: farmScreens.<key>, lazy: lazyRoute(() => import('./routes/<screen>')) };
 *   3. `ready: true` on its entry in src/app/nav.ts — the menus pick it up from there.
 */
export const farmRoutes: RouteObject[] = [
  { index: true, lazy: lazyRoute(() => import('./routes/farm-home')) },
  { path: farmScreens.map, lazy: lazyRoute(() => import('./routes/map')) },
  { path: farmScreens.alerts, lazy: lazyRoute(() => import('./routes/alerts')) },
  { path: farmScreens.units, lazy: lazyRoute(() => import('./routes/units')) },
  { path: farmScreens.unit, lazy: lazyRoute(() => import('./routes/unit')) },
  { path: farmScreens.morningReport, lazy: lazyRoute(() => import('./routes/morning-report')) },
  { path: farmScreens.rations, lazy: lazyRoute(() => import('./routes/rations')) },
  { path: farmScreens.tasks, lazy: lazyRoute(() => import('./routes/tasks')) },
  { path: farmScreens.pondside, lazy: lazyRoute(() => import('./routes/pondside')) },
  { path: farmScreens.unitTest, lazy: lazyRoute(() => import('./routes/pondside')) },
  { path: farmScreens.unitLabel, lazy: lazyRoute(() => import('./routes/unit-label')) },
  { path: farmScreens.nightRound, lazy: lazyRoute(() => import('./routes/night-round')) },
  { path: farmScreens.treatments, lazy: lazyRoute(() => import('./routes/treatments')) },
  { path: farmScreens.observations, lazy: lazyRoute(() => import('./routes/observations')) },
  { path: farmScreens.setup, lazy: lazyRoute(() => import('./routes/setup')) },
  { path: farmScreens.people, lazy: lazyRoute(() => import('./routes/setup-people')) },
  { path: farmScreens.stock, lazy: lazyRoute(() => import('./routes/stock')) },
  { path: farmScreens.imports, lazy: lazyRoute(() => import('./routes/imports')) },
  { path: farmScreens.records, lazy: lazyRoute(() => import('./routes/records')) },
  { path: farmScreens.audit, lazy: lazyRoute(() => import('./routes/audit')) },
  { path: farmScreens.outbox, lazy: lazyRoute(() => import('./routes/outbox')) },
  { path: '*', lazy: lazyRoute(() => import('./routes/not-found')) },
];

export const appRoutes: RouteObject[] = [
  {
    id: 'root',
    Component: RootLayout,
    ErrorBoundary: RouteError,
    HydrateFallback: BootFallback,
    children: [
      { index: true, lazy: lazyRoute(() => import('./routes/index-redirect')) },
      { path: paths.signIn, lazy: lazyRoute(() => import('./routes/sign-in')) },
      { path: paths.forgotPassword, lazy: lazyRoute(() => import('./routes/forgot-password')) },
      { path: paths.resetPassword, lazy: lazyRoute(() => import('./routes/reset-password')) },
      { path: paths.farm, lazy: lazyRoute(() => import('./routes/farm-shell')), children: farmRoutes },
      { path: '*', lazy: lazyRoute(() => import('./routes/not-found')) },
    ],
  },
];

export function createAppRouter() {
  return createBrowserRouter(appRoutes);
}

export function AppRouter() {
  const [router] = useState(createAppRouter);
  return <RouterProvider router={router} />;
}
