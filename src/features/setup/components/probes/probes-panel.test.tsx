import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { farmA, meFixture, mockApi, renderWithApp } from '@/test/render';
import { ProbesPanel } from './probes-panel';

const unitId = '66666666-6666-4666-8666-666666666666';
const probeId = '77777777-7777-4777-8777-777777777777';
const now = '2026-12-01T12:00:00.000Z';
const SECRET = 'hX9k2-only-shown-once-Qp7w3vT8';

const unit = {
  id: unitId,
  farmId: farmA,
  code: 'P7',
  name: 'Pond 7',
  kind: 'pond',
  outline: null,
  areaM2: null,
  volumeM3: null,
  waterType: 'fresh',
  defaultSalinityPpt: 0,
  species: null,
  lifeStage: null,
  state: 'cycling',
  testFrequencyDays: null,
  qrLabelId: 'abc123',
  walkOrder: 1,
  thresholdProfileId: null,
  feedProteinFraction: 0.32,
  closeWatchUntil: null,
  createdAt: now,
  updatedAt: now,
};

const probe = {
  id: probeId,
  farmId: farmA,
  unitId,
  probeKey: 'hb-p7-sonde',
  label: 'P7 sonde',
  model: null,
  quantities: ['water_temperature', 'dissolved_oxygen', 'ph'],
  intervalSeconds: 60,
  active: true,
  secretRotatedAt: now,
  lastSeenAt: null,
  batteryPct: null,
  rssiDbm: null,
  createdAt: now,
  health: {
    probeId,
    probeKey: 'hb-p7-sonde',
    unitId,
    state: 'silent',
    lastSeenAt: null,
    lastReadingAt: null,
    batteryPct: null,
    rssiDbm: null,
    rejects: [],
    findings: [],
  },
};

const credential = (secret: string) => ({
  probe,
  credential: { username: 'hb-p7-sonde', secret, topic: 'gillwise/v1/probes/hb-p7-sonde/readings', issuedAt: now },
});

function setup() {
  let created = false;
  const api = mockApi({
    'GET /api/me': () => ({ status: 200, body: meFixture('manager') }),
    [`GET /api/farms/${farmA}/units`]: () => ({ status: 200, body: { units: [unit] } }),
    [`GET /api/farms/${farmA}/probes`]: () => ({ status: 200, body: { probes: created ? [probe] : [] } }),
    [`POST /api/farms/${farmA}/probes`]: () => {
      created = true;
      return { status: 201, body: credential(SECRET) };
    },
    [`POST /api/farms/${farmA}/probes/${probeId}/credential`]: () => ({ status: 200, body: credential('second-secret-Zr4m1kLq9w') }),
  });
  const view = renderWithApp(<ProbesPanel farmId={farmA} timeZone="America/Chicago" canEdit />);
  return { api, user: userEvent.setup(), ...view };
}

describe('ProbesPanel: the probe secret', () => {
  it('is shown once after creating a probe, with a warning and a copy button, and is gone once the dialog closes', async () => {
    const { api, user, queryClient } = setup();
    await user.click(await screen.findByRole('button', { name: 'Add a probe' }));
    await user.type(screen.getByLabelText('Name'), 'P7 sonde');
    await user.selectOptions(screen.getByLabelText('Sits in'), unitId);
    await user.click(screen.getByRole('button', { name: 'Add and show the secret' }));

    const dialog = await screen.findByRole('dialog');
    expect(within(dialog).getByTestId('secret-value').textContent).toBe(SECRET);
    expect(dialog.textContent).toContain('You will see this secret only now');
    expect(within(dialog).getByRole('button', { name: 'Copy the Secret' })).toBeTruthy();
    const sent = api.calls.find((c) => c.method === 'POST' && c.url.endsWith('/probes'));
    expect(sent?.body).toEqual({
      label: 'P7 sonde',
      unitId,
      quantities: ['water_temperature', 'dissolved_oxygen', 'ph'],
      intervalSeconds: 60,
      model: null,
    });

    // "Done" waits until the secret is confirmed as stored in the probe.
    const done = within(dialog).getByRole('button', { name: 'Done' }) as HTMLButtonElement;
    expect(done.disabled).toBe(true);
    await user.click(within(dialog).getByLabelText('I have put the secret in the probe.'));
    await user.click(done);

    await waitFor(() => expect(screen.queryByTestId('probe-secret')).toBeNull());
    expect(document.body.textContent).not.toContain(SECRET);
    // The probe is listed without it, and nothing in the query or mutation caches still holds it.
    expect((await screen.findByTestId('probe-card')).textContent).toContain('P7 sonde');
    const cached = JSON.stringify([
      queryClient
        .getQueryCache()
        .getAll()
        .map((q) => q.state.data),
      queryClient
        .getMutationCache()
        .getAll()
        .map((m) => m.state.data),
    ]);
    expect(cached).not.toContain(SECRET);
  });

  it('rotating asks first, then shows the new secret once', async () => {
    const { user } = setup();
    await user.click(await screen.findByRole('button', { name: 'Add a probe' }));
    await user.type(screen.getByLabelText('Name'), 'P7 sonde');
    await user.click(screen.getByRole('button', { name: 'Add and show the secret' }));
    const first = await screen.findByRole('dialog');
    await user.click(within(first).getByLabelText('I have put the secret in the probe.'));
    await user.click(within(first).getByRole('button', { name: 'Done' }));
    await waitFor(() => expect(screen.queryByTestId('probe-secret')).toBeNull());

    await user.click(await screen.findByRole('button', { name: 'New secret' }));
    const confirm = await screen.findByRole('dialog');
    expect(confirm.textContent).toContain('The old secret stops working at once');
    await user.click(within(confirm).getByRole('button', { name: 'Make a new secret' }));
    await waitFor(() => expect(screen.getByTestId('secret-value').textContent).toBe('second-secret-Zr4m1kLq9w'));
    expect(document.body.textContent).not.toContain(SECRET);
    // Closed without ticking the box (the ✕): the secret goes all the same.
    await user.click(within(screen.getByTestId('probe-secret').closest('dialog')!).getByRole('button', { name: 'Close' }));
    await waitFor(() => expect(screen.queryByTestId('probe-secret')).toBeNull());
    expect(document.body.textContent).not.toContain('second-secret-Zr4m1kLq9w');
  });
});
