/**
 * Test helpers for client component tests (vitest + jsdom + Testing Library).
 * Importing this file also registers cleanup after each test (see ./setup.ts).
 */
import type { MeResponse } from '@shared/schemas/auth.schema';
import { QueryClient } from '@tanstack/react-query';
import { render, type RenderResult } from '@testing-library/react';
import type { ReactElement } from 'react';
import { createMemoryRouter, RouterProvider, type RouteObject } from 'react-router';
import { afterEach, vi } from 'vitest';
import { AppProvider } from '@/app/provider';
import { i18n } from '@/lib/i18n';

// Also registered through setupFiles; importing it here keeps `vitest --environment jsdom src` working without the config.
import './setup';

afterEach(() => {
  void i18n.changeLanguage('en');
});

export function testQueryClient(): QueryClient {
  return new QueryClient({ defaultOptions: { queries: { retry: false, gcTime: Infinity }, mutations: { retry: false } } });
}

/** Render inside the app's providers and a memory router at `route`. */
export function renderWithApp(
  ui: ReactElement | null,
  { route = '/', routes, queryClient = testQueryClient() }: { route?: string; routes?: RouteObject[]; queryClient?: QueryClient } = {},
): RenderResult & { router: ReturnType<typeof createMemoryRouter>; queryClient: QueryClient } {
  const router = createMemoryRouter(routes ?? [{ path: '*', element: ui }], { initialEntries: [route] });
  const result = render(
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return { ...result, router, queryClient };
}

export interface MockCall {
  url: string;
  method: string;
  headers: Record<string, string>;
  body: unknown;
  credentials: RequestCredentials | undefined;
}

type Responder = (call: MockCall) => { status: number; body?: unknown } | Promise<{ status: number; body?: unknown }>;

/** Replace fetch with a router of `METHOD /path` → responder. Unknown requests answer 404. */
export function mockApi(handlers: Record<string, Responder>): { calls: MockCall[] } {
  const calls: MockCall[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const url = typeof input === 'string' ? input : input instanceof URL ? input.href : input.url;
    const method = (init.method ?? 'GET').toUpperCase();
    const headers = Object.fromEntries(Object.entries((init.headers as Record<string, string>) ?? {}).map(([k, v]) => [k.toLowerCase(), v]));
    const call: MockCall = {
      url,
      method,
      headers,
      body: typeof init.body === 'string' ? JSON.parse(init.body) : undefined,
      credentials: init.credentials,
    };
    calls.push(call);
    const path = new URL(url, 'http://127.0.0.1').pathname;
    const handler = handlers[`${method} ${path}`];
    const { status, body } = handler
      ? await handler(call)
      : { status: 404, body: { error: { code: 'not_found', message: 'Not found' } } };
    return new Response(body === undefined ? null : JSON.stringify(body), {
      status,
      headers: body === undefined ? {} : { 'content-type': 'application/json' },
    });
  });
  vi.stubGlobal('fetch', fetchMock);
  return { calls };
}

export const farmA = '11111111-1111-4111-8111-111111111111';
export const farmB = '22222222-2222-4222-8222-222222222222';

export function meFixture(role: 'hand' | 'manager' | 'planner' | 'admin' = 'hand', overrides: Partial<MeResponse['user']> = {}): MeResponse {
  return {
    user: {
      id: '33333333-3333-4333-8333-333333333333',
      email: `${role}@harrowbend.example`,
      name: 'Rosa Delgado',
      locale: 'en',
      isAdmin: role === 'admin',
      prefs: { temperatureUnit: 'C', concentrationUnit: 'mg/L', ammoniaBasis: 'nh3' },
      ...overrides,
    },
    farms: [
      { id: farmA, name: 'Harrow Bend Fish Farm', slug: 'harrow-bend', timeZone: 'America/Chicago', role: role === 'admin' ? 'manager' : role },
    ],
  };
}
