import type { AlertDto } from '@shared/schemas/alerts.schema';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { farmA, meFixture, mockApi, renderWithApp, type MockCall } from '@/test/render';
import { AlertList } from './alert-list';

const unitId = '44444444-4444-4444-8444-444444444444';
const alertId = '88888888-8888-4888-8888-888888888888';
const handId = '99999999-9999-4999-8999-999999999999';
const me = meFixture('manager');

// An invented NH3 alert on raceway R3 (values as the server would send them).
function nh3Alert(overrides: Partial<AlertDto> = {}): AlertDto {
  return {
    id: alertId,
    farmId: farmA,
    unitId,
    unitCode: 'R3',
    unitName: 'Raceway 3',
    probeId: null,
    probeLabel: null,
    kind: 'nh3_high',
    level: 'act',
    state: 'open',
    conditionKey: `unit:${unitId}:nh3_high`,
    title: 'Free ammonia high in R3',
    message: 'Free ammonia 0.052 mg/L NH3 is above the act limit 0.05 mg/L NH3.',
    values: { value: 0.052, basis: 'mg/L NH3' },
    rule: {
      metric: 'nh3',
      threshold: 0.05,
      watch: 0.02,
      act: 0.05,
      basis: 'mg/L NH3',
      source: 'common practice, no source',
      clearsAt: 0.019,
      salinityPpt: null,
      profileId: null,
      profileName: 'Rainbow trout',
    },
    openedAt: '2026-12-01T12:58:00.000Z',
    lastSeenAt: '2026-12-01T12:58:00.000Z',
    acknowledgedAt: null,
    acknowledgedBy: null,
    assignedTo: null,
    resolvedAt: null,
    resolvedBy: null,
    resolutionNote: null,
    escalationStep: 0,
    nextEscalationAt: null,
    realertAt: null,
    ...overrides,
  };
}

const base = `/api/farms/${farmA}/alerts`;

/** A tiny fake of the alerts API: one alert whose state the action routes change. */
function fakeAlertsApi(role: 'manager' | 'hand' = 'manager', options: { ackStatus?: number } = {}) {
  let alert = nh3Alert();
  const person = (c: MockCall) => ({ id: me.user.id, name: me.user.name, ...(c.body as object) });
  return mockApi({
    'GET /api/me': () => ({ status: 200, body: meFixture(role) }),
    [`GET ${base}`]: () => ({ status: 200, body: { alerts: alert.state === 'resolved' ? [] : [alert], nextCursor: null } }),
    [`GET /api/farms/${farmA}/people`]: () => ({
      status: 200,
      body: {
        people: [
          {
            userId: handId,
            email: 'hand@harrowbend.example',
            name: 'Marisol Ortega',
            role: 'hand',
            active: true,
            invited: false,
            lastLoginAt: null,
            memberSince: '2026-01-01T00:00:00.000Z',
          },
          {
            userId: 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa',
            email: 'gone@harrowbend.example',
            name: 'Left Last Year',
            role: 'hand',
            active: false,
            invited: false,
            lastLoginAt: null,
            memberSince: '2025-01-01T00:00:00.000Z',
          },
        ],
      },
    }),
    [`POST ${base}/${alertId}/acknowledge`]: (c) => {
      if (options.ackStatus)
        return { status: options.ackStatus, body: { error: { code: 'alert_resolved', message: 'This alert is already resolved.' } } };
      alert = {
        ...alert,
        state: 'acknowledged',
        acknowledgedAt: '2026-12-01T13:05:00.000Z',
        acknowledgedBy: { id: person(c).id, name: person(c).name },
      };
      return { status: 200, body: alert };
    },
    [`POST ${base}/${alertId}/assign`]: (c) => {
      const { userId } = c.body as { userId: string };
      alert = { ...alert, assignedTo: { id: userId, name: userId === handId ? 'Marisol Ortega' : me.user.name } };
      return { status: 200, body: alert };
    },
    [`POST ${base}/${alertId}/resolve`]: (c) => {
      alert = { ...alert, state: 'resolved', resolvedAt: '2026-12-01T14:00:00.000Z', resolutionNote: (c.body as { note: string }).note };
      return { status: 200, body: alert };
    },
  });
}

function renderList() {
  const ui = <AlertList farmId={farmA} timeZone="America/Chicago" filters={{ state: 'active' }} emptyTitle="Nothing open" />;
  return renderWithApp(null, { routes: [{ path: '/farms/:farmId/alerts', element: ui }], route: `/farms/${farmA}/alerts` });
}

const posts = (calls: MockCall[], action: string) => calls.filter((c) => c.method === 'POST' && c.url.endsWith(`/${action}`));

describe('alert actions', () => {
  it('shows what crossed which limit, by level word and shape as well as colour', async () => {
    fakeAlertsApi();
    renderList();
    const card = await screen.findByRole('article', { name: 'Free ammonia high — R3 · Raceway 3' });
    expect(within(card).getByRole('img', { name: 'Status: Act' }).textContent).toBe('◆Act');
    expect(card.textContent).toContain('Measured 0.052 mg/L NH3, act limit 0.05 mg/L NH3');
    expect(card.textContent).toContain('Opened 06:58');
    expect(within(card).getByTestId('alert-state').textContent).toContain('Open');
  });

  it('acknowledges an open alert and shows who did it', async () => {
    const { calls } = fakeAlertsApi();
    renderList();
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Acknowledge' }));
    await waitFor(() => expect(posts(calls, 'acknowledge')).toHaveLength(1));
    expect(posts(calls, 'acknowledge')[0]!.body).toEqual({});
    expect(posts(calls, 'acknowledge')[0]!.headers['x-gillwise-client']).toBe('web');
    expect(await screen.findByText('Acknowledged by Rosa Delgado at 07:05')).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Acknowledge' })).toBeNull();
  });

  it('says so when the alert was resolved in the meantime', async () => {
    fakeAlertsApi('manager', { ackStatus: 409 });
    renderList();
    await userEvent.click(await screen.findByRole('button', { name: 'Acknowledge' }));
    expect((await screen.findByRole('alert')).textContent).toContain('This alert was resolved in the meantime.');
  });

  it('assigns the alert to an active person of the farm', async () => {
    const { calls } = fakeAlertsApi();
    renderList();
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Assign…' }));
    const dialog = screen.getByRole('dialog', { name: 'Give this alert to someone' });
    const select = within(dialog).getByRole('combobox', { name: /Person/ });
    await waitFor(() => expect(within(select).getByRole('option', { name: 'Marisol Ortega (Farm hand)' })).toBeTruthy());
    expect(within(select).getByRole('option', { name: 'Me (Rosa Delgado)' })).toBeTruthy();
    expect(within(select).queryByRole('option', { name: /Left Last Year/ })).toBeNull();
    await user.selectOptions(select, handId);
    await user.click(within(dialog).getByRole('button', { name: 'Assign' }));
    await waitFor(() => expect(posts(calls, 'assign')[0]?.body).toEqual({ userId: handId }));
    expect(await screen.findByText('Assigned to Marisol Ortega')).toBeTruthy();
  });

  it('will not resolve without a note, then resolves with one', async () => {
    const { calls } = fakeAlertsApi();
    renderList();
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Resolve…' }));
    const dialog = screen.getByRole('dialog', { name: 'Resolve this alert' });
    await user.click(within(dialog).getByRole('button', { name: 'Resolve' }));
    const note = within(dialog).getByLabelText('What was done');
    expect(note.getAttribute('aria-invalid')).toBe('true');
    expect(dialog.textContent).toContain('Say in a few words what was done');
    expect(posts(calls, 'resolve')).toHaveLength(0);

    await user.type(note, 'Opened the inlet valve; flow back to 2,400 L/min.');
    await user.click(within(dialog).getByRole('button', { name: 'Resolve' }));
    await waitFor(() => expect(posts(calls, 'resolve')[0]?.body).toEqual({ note: 'Opened the inlet valve; flow back to 2,400 L/min.' }));
    expect(await screen.findByText('Nothing open')).toBeTruthy();
  });

  it('lets a hand acknowledge but not assign or resolve (the API’s rule)', async () => {
    fakeAlertsApi('hand');
    renderList();
    expect(await screen.findByRole('button', { name: 'Acknowledge' })).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Assign…' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Resolve…' })).toBeNull();
  });
});
