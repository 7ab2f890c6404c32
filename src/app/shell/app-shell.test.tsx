import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { farmA, farmB, meFixture, mockApi, renderWithApp } from '@/test/render';
import { appRoutes } from '../router';
import { homePathFor, navFor, splitForTabBar } from '../nav';
import { TAB_MAX } from './tab-bar';

const unauthenticated = () => ({ status: 401, body: { error: { code: 'unauthenticated', message: 'Sign in' } } });

describe('app shell', () => {
  it('sends a visitor who is not signed in to sign-in, remembering the page', async () => {
    mockApi({ 'GET /api/me': unauthenticated });
    const { router } = renderWithApp(null, { routes: appRoutes, route: `/farms/${farmA}` });
    await screen.findByRole('heading', { name: 'Sign in' });
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent(`/farms/${farmA}`)}`);
  });

  for (const role of ['hand', 'manager', 'planner', 'admin'] as const) {
    it(`sends a ${role} from / to their own landing screen`, async () => {
      mockApi({ 'GET /api/me': () => ({ status: 200, body: meFixture(role) }) });
      const { router } = renderWithApp(null, { routes: appRoutes, route: '/' });
      await waitFor(() => expect(router.state.location.pathname).toBe(homePathFor(role, farmA)), { timeout: 8000 });
    });

    it(`shows a ${role} their home, their farm and only their ready screens`, async () => {
      mockApi({ 'GET /api/me': () => ({ status: 200, body: meFixture(role) }) });
      renderWithApp(null, { routes: appRoutes, route: `/farms/${farmA}` });
      const home = await screen.findByTestId(`home-${role}`);
      expect(within(home).getByTestId('who-farm').textContent).toBe('Harrow Bend Fish Farm');
      expect(within(home).getByText(/Fish health decisions rest with the farm's veterinarian/)).toBeTruthy();
      const tabKeys = [...screen.getByTestId('tab-bar').querySelectorAll('[data-nav-key]')].map((a) => a.getAttribute('data-nav-key'));
      expect(tabKeys).toEqual(splitForTabBar(navFor(role), TAB_MAX - 1).tabs.map((e) => e.key));
      const sideKeys = [...screen.getByTestId('side-nav').querySelectorAll('[data-nav-key]')].map((a) => a.getAttribute('data-nav-key'));
      expect(sideKeys).toEqual(navFor(role).map((e) => e.key));
    });
  }

  it('switches the language and saves it on the user', async () => {
    const me = meFixture('hand');
    const { calls } = mockApi({
      'GET /api/me': () => ({ status: 200, body: me }),
      'PATCH /api/me': (c) => ({ status: 200, body: { ...me, user: { ...me.user, ...(c.body as object) } } }),
    });
    renderWithApp(null, { routes: appRoutes, route: `/farms/${farmA}` });
    await screen.findByTestId('home-hand');
    await userEvent.click(screen.getByRole('button', { name: 'Español' }));
    await screen.findByRole('heading', { name: 'Hola, Rosa Delgado' });
    await waitFor(() => expect(calls.find((c) => c.method === 'PATCH')?.body).toEqual({ locale: 'es' }));
    expect(document.documentElement.lang).toBe('es');
  });

  it('offers a farm picker only when the user has several farms', async () => {
    const me = meFixture('manager');
    me.farms.push({ id: farmB, name: 'Cold Spring Raceways', slug: 'cold-spring', timeZone: 'America/Denver', role: 'hand' });
    mockApi({ 'GET /api/me': () => ({ status: 200, body: me }) });
    const { router } = renderWithApp(null, { routes: appRoutes, route: `/farms/${farmA}` });
    await screen.findByTestId('home-manager');
    const pickers = screen.getAllByRole('combobox', { name: 'Farm' });
    await userEvent.selectOptions(pickers[0]!, farmB);
    await screen.findByTestId('home-hand');
    expect(router.state.location.pathname).toBe(`/farms/${farmB}`);
  });

  it('says so when the farm in the address is not one of the user’s', async () => {
    mockApi({ 'GET /api/me': () => ({ status: 200, body: meFixture('hand') }) });
    renderWithApp(null, { routes: appRoutes, route: `/farms/${farmB}` });
    expect(await screen.findByRole('heading', { name: 'No access to this farm' })).toBeTruthy();
  });

  it('answers unknown addresses with "not found"', async () => {
    mockApi({ 'GET /api/me': () => ({ status: 200, body: meFixture('hand') }) });
    renderWithApp(null, { routes: appRoutes, route: `/farms/${farmA}/no-such-screen` });
    expect(await screen.findByRole('heading', { name: 'Page not found' })).toBeTruthy();
  });
});
