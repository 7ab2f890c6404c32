import 'fake-indexeddb/auto';
import { freeAmmonia } from '@shared/chemistry';
import type { UnitDto } from '@shared/schemas/units.schema';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { clear, createStore, values } from 'idb-keyval';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { farmA, meFixture, mockApi, renderWithApp, type MockCall } from '@/test/render';
import { outbox, type OutboxEntry } from '../lib/outbox';
import { PondsideTest } from './pondside-test';

const unitId = '44444444-4444-4444-8444-444444444444';
const probeId = '55555555-5555-4555-8555-555555555555';
const now = () => new Date().toISOString();
const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000).toISOString();

const unit: UnitDto = {
  id: unitId,
  farmId: farmA,
  code: 'P1',
  name: 'Pond 1 — North Levee',
  kind: 'pond',
  outline: null,
  areaM2: 15400,
  volumeM3: 18480,
  waterType: 'fresh',
  defaultSalinityPpt: 0,
  species: 'channel_catfish',
  lifeStage: 'food_fish',
  state: 'active',
  testFrequencyDays: null,
  qrLabelId: 'harrow-bend-p1-abcd1234',
  walkOrder: 0,
  thresholdProfileId: null,
  feedProteinFraction: 0.32,
  closeWatchUntil: null,
  createdAt: now(),
  updatedAt: now(),
};

const status = (ph: number, temperatureC: number) => ({
  farmId: farmA,
  timeZone: 'America/Chicago',
  localDay: now().slice(0, 10),
  generatedAt: now(),
  units: [
    {
      id: unitId,
      code: 'P1',
      name: unit.name,
      kind: 'pond',
      state: 'active',
      waterType: 'fresh',
      walkOrder: 0,
      outline: null,
      latest: {
        ph: { value: ph, unit: 'pH', at: minutesAgo(5), quality: 'good', probeId },
        water_temperature: { value: temperatureC, unit: 'C', at: minutesAgo(5), quality: 'good', probeId },
      },
      lastReadingAt: minutesAgo(5),
      status: null,
      latestResult: null,
    },
  ],
});

const storedTest = (body: Record<string, unknown>, withResult: boolean) => ({
  id: '66666666-6666-4666-8666-666666666666',
  farmId: farmA,
  unitId,
  clientId: body.clientId,
  analyte: body.analyte,
  method: body.method,
  basis: body.basis,
  value: body.value,
  unit: 'mg/L',
  sampledAt: body.sampledAt ?? now(),
  handheldPh: null,
  handheldTemperatureC: null,
  handheldSalinityPpt: null,
  aeratorOn: null,
  note: null,
  photoUrl: null,
  source: 'pondside',
  enteredById: null,
  version: 1,
  createdAt: now(),
  updatedAt: now(),
  result: withResult
    ? {
        id: '77777777-7777-4777-8777-777777777777',
        waterTestId: '66666666-6666-4666-8666-666666666666',
        unitId,
        sampledAt: body.sampledAt ?? now(),
        status: 'ok',
        tanMgL: 1,
        nh3NMgL: 0.05,
        nh3MgL: 0.0608,
        fraction: 0.05,
        pKa: 9.25,
        method: 'emerson1975',
        pHScale: 'nbs',
        pH: 8.12,
        temperatureC: 27,
        salinityPpt: 0,
        provenance: {
          values: [
            {
              quantity: 'ph',
              value: 8.12,
              source: 'probe_interpolated',
              probeId,
              probeLabel: 'P1 sonde',
              readings: [
                { at: minutesAgo(3), value: 8.1 },
                { at: minutesAgo(1), value: 8.14 },
              ],
            },
            {
              quantity: 'water_temperature',
              value: 27,
              source: 'probe',
              probeId,
              probeLabel: 'P1 sonde',
              readings: [{ at: minutesAgo(2), value: 27 }],
            },
            { quantity: 'salinity', value: 0, source: 'unit_default', probeId: null, probeLabel: null, readings: [] },
          ],
          windowMinutes: 30,
          missing: [],
        },
        flags: [],
        forecastPeak: null,
        computedAt: now(),
        testVersion: 1,
      }
    : null,
});

type Handlers = Parameters<typeof mockApi>[0];

function baseHandlers(extra: Handlers = {}, probe = { ph: 8.0, temperatureC: 25 }): Handlers {
  return {
    'GET /api/me': () => ({ status: 200, body: meFixture('hand') }),
    [`GET /api/farms/${farmA}/units`]: () => ({ status: 200, body: { units: [unit] } }),
    [`GET /api/farms/${farmA}/status`]: () => ({ status: 200, body: status(probe.ph, probe.temperatureC) }),
    [`GET /api/farms/${farmA}/tasks`]: () => ({ status: 200, body: { day: now().slice(0, 10), timeZone: 'America/Chicago', tests: [] } }),
    [`GET /api/farms/${farmA}/units/${unitId}/tests`]: () => ({ status: 200, body: { tests: [] } }),
    ...extra,
  };
}

const posts = (calls: MockCall[]) => calls.filter((c) => c.method === 'POST' && c.url.endsWith(`/units/${unitId}/tests`));
const store = createStore('gillwise-outbox', 'entries');

async function renderForm(handlers: Handlers, unitIdFromUrl: string | null = unitId) {
  const api = mockApi(handlers);
  renderWithApp(<PondsideTest farmId={farmA} timeZone="America/Chicago" unitIdFromUrl={unitIdFromUrl ?? undefined} />);
  const user = userEvent.setup();
  await screen.findByRole('textbox', { name: /Ammonia \(TAN\) reading/ });
  return { api, user };
}

describe('the pondside test form', { timeout: 20_000 }, () => {
  beforeEach(async () => {
    localStorage.clear();
    sessionStorage.clear();
    outbox.reset();
    await clear(store);
  });
  afterEach(() => {
    outbox.reset();
    vi.restoreAllMocks();
  });

  it('puts the shared schema’s problems beside the fields and sends nothing', async () => {
    const { api, user } = await renderForm(baseHandlers(), null);
    await user.click(screen.getByTestId('save-test'));
    expect(await screen.findByText('Choose the unit you tested.')).toBeTruthy();
    const reading = screen.getByRole('textbox', { name: /reading/ });
    expect(reading.getAttribute('aria-invalid')).toBe('true');
    expect(document.getElementById(reading.getAttribute('aria-describedby')!.split(' ').pop()!)?.textContent).toContain(
      'Enter the reading, or tap a card step.',
    );

    await user.click(screen.getByRole('button', { name: /P1/ }));
    await user.type(reading, '150');
    await waitFor(() => expect(screen.getByText('Must be between 0 mg/L and 100 mg/L.')).toBeTruthy());
    await user.clear(reading);
    await user.type(reading, '0,5');
    await user.type(screen.getByRole('textbox', { name: 'Handheld pH' }), '15');
    await user.click(screen.getByTestId('save-test'));
    const ph = screen.getByRole('textbox', { name: 'Handheld pH' });
    await waitFor(() => expect(ph.getAttribute('aria-invalid')).toBe('true'));
    expect(screen.getByText('Must be between 0 and 14.')).toBeTruthy();
    expect(posts(api.calls)).toHaveLength(0);
  });

  it('shows the free ammonia at once, from shared/chemistry with the unit’s probe pH and temperature', async () => {
    const { user } = await renderForm(baseHandlers());
    await screen.findByTestId('probe-now');
    await user.click(screen.getByRole('button', { name: '1' }));
    const expected = freeAmmonia({ readingMgL: 1, basis: 'tan-n', pH: 8.0, temperatureC: 25, salinityPpt: 0 });
    const value = await screen.findByTestId('instant-result-value');
    expect(value.textContent).toBe(expected.nh3MgL.toFixed(3));
    const section = screen.getByTestId('instant-section');
    expect(within(section).getByText(/pH 8 from the probe/)).toBeTruthy();
    // No limits for this unit: the common-practice caution instead of a level.
    expect(within(section).getByText(/about 0.02 mg\/L NH3 can already harm fish/)).toBeTruthy();

    // As NH3 on the card: the same reading means less nitrogen, so less free ammonia.
    await user.click(screen.getByRole('radio', { name: /As NH3 \(total\)/ }));
    const asNh3 = freeAmmonia({ readingMgL: 1, basis: 'total-nh3', pH: 8.0, temperatureC: 25, salinityPpt: 0 });
    await waitFor(() => expect(screen.getByTestId('instant-result-value').textContent).toBe(asNh3.nh3MgL.toFixed(3)));
  });

  it('falls back to the handheld pH and temperature when the probe has nothing fresh', async () => {
    const stale = baseHandlers({
      [`GET /api/farms/${farmA}/status`]: () => {
        const s = status(8, 25);
        s.units[0]!.latest.ph.at = minutesAgo(180);
        s.units[0]!.latest.water_temperature.at = minutesAgo(180);
        return { status: 200, body: s };
      },
    });
    const { user } = await renderForm(stale);
    await screen.findByTestId('probe-now');
    await user.type(screen.getByRole('textbox', { name: /reading/ }), '2');
    expect((await screen.findByTestId('instant-needs')).textContent).toContain('No probe pH within 30 min');
    await user.type(screen.getByRole('textbox', { name: 'Handheld pH' }), '8,6');
    await user.type(screen.getByRole('textbox', { name: /Water temperature/ }), '29');
    const expected = freeAmmonia({ readingMgL: 2, basis: 'tan-n', pH: 8.6, temperatureC: 29, salinityPpt: 0 });
    await waitFor(() => expect(screen.getByTestId('instant-result-value').textContent).toBe(expected.nh3MgL.toFixed(3)));
  });

  it('queues the test on the device while offline, then sends it once when the connection returns', async () => {
    const online = vi.spyOn(navigator, 'onLine', 'get').mockReturnValue(false);
    let stored = false;
    const { api, user } = await renderForm(
      baseHandlers({
        [`POST /api/farms/${farmA}/units/${unitId}/tests`]: (c) => {
          const created = !stored;
          stored = true;
          return { status: created ? 201 : 200, body: storedTest(c.body as Record<string, unknown>, false) };
        },
        [`GET /api/farms/${farmA}/tests/66666666-6666-4666-8666-666666666666`]: () => ({
          status: 200,
          body: storedTest((posts(api.calls)[0]?.body ?? {}) as Record<string, unknown>, true),
        }),
      }),
    );
    await user.click(screen.getByRole('button', { name: '1' }));
    await user.click(screen.getByTestId('save-test'));

    const state = await screen.findByTestId('send-state');
    expect(state.getAttribute('data-state')).toBe('waiting');
    expect(posts(api.calls)).toHaveLength(0);
    const queued = await values<OutboxEntry>(store);
    expect(queued).toHaveLength(1);
    expect(queued[0]?.body).toMatchObject({ analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 1, source: 'pondside' });
    const clientId = queued[0]!.id;
    expect(queued[0]?.body.clientId).toBe(clientId);

    online.mockReturnValue(true);
    window.dispatchEvent(new Event('online'));
    window.dispatchEvent(new Event('online'));

    expect(await screen.findByTestId('stored-result', {}, { timeout: 5000 })).toBeTruthy();
    expect(posts(api.calls)).toHaveLength(1);
    expect((posts(api.calls)[0]?.body as { clientId: string }).clientId).toBe(clientId);
    expect(await values(store)).toHaveLength(0);
    expect(screen.getByTestId('prov-ph').textContent).toMatch(
      /pH 8.12 from probe P1 sonde at \d\d:\d\d, interpolated between the readings at/,
    );
  });

  it('keeps a refused entry (4xx) on the device with the server’s words, to fix and resend', async () => {
    const { api, user } = await renderForm(
      baseHandlers({
        [`POST /api/farms/${farmA}/units/${unitId}/tests`]: () => ({
          status: 400,
          body: {
            error: {
              code: 'validation_failed',
              message: 'Some fields are not valid.',
              details: { fieldErrors: { value: ['out of the kit range'] } },
            },
          },
        }),
      }),
    );
    await user.click(screen.getByRole('button', { name: '2' }));
    await user.click(screen.getByTestId('save-test'));
    await waitFor(() => expect(screen.getByTestId('send-state').getAttribute('data-state')).toBe('rejected'));
    expect(screen.getByTestId('send-state').textContent).toContain('Reading: out of the kit range');
    const kept = await values<OutboxEntry>(store);
    expect(kept).toHaveLength(1);
    expect(kept[0]?.state).toBe('rejected');
    expect(posts(api.calls)).toHaveLength(1);

    await user.click(screen.getAllByRole('button', { name: 'Fix and send again' })[0]!);
    const reading = await screen.findByRole('textbox', { name: /reading/ });
    expect((reading as HTMLInputElement).value).toBe('2');
    expect(screen.getByText('out of the kit range')).toBeTruthy();
  });

  it('keeps what was typed across a reload', async () => {
    const first = await renderForm(baseHandlers());
    await first.user.type(screen.getByRole('textbox', { name: /reading/ }), '0,75');
    await first.user.type(screen.getByRole('textbox', { name: 'Handheld pH' }), '7,9');
    document.body.innerHTML = '';
    sessionStorage.clear();

    await renderForm(baseHandlers());
    expect((screen.getByRole('textbox', { name: /reading/ }) as HTMLInputElement).value).toBe('0,75');
    expect((screen.getByRole('textbox', { name: 'Handheld pH' }) as HTMLInputElement).value).toBe('7,9');
  });
});
