import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { farmA, meFixture, mockApi, renderWithApp } from '@/test/render';
import { i18n } from '@/lib/i18n';
import { nesslerResult, raceway, unitIdR3 } from '../test/fixtures';
import { UnitSheet } from './unit-sheet';

const latestPath = `GET /api/farms/${farmA}/units/${unitIdR3}/results/latest`;

function setup(result: ReturnType<typeof nesslerResult> | null, unit = raceway(), locale: 'en' | 'es' = 'en') {
  const api = mockApi({
    'GET /api/me': () => ({ status: 200, body: meFixture('manager', { locale }) }),
    [latestPath]: () => ({ status: 200, body: { result } }),
  });
  const onClose = vi.fn();
  renderWithApp(
    <UnitSheet
      farmId={farmA}
      timeZone="America/Chicago"
      unit={unit}
      onClose={onClose}
      unitHref={`/farms/${farmA}/units/${unitIdR3}`}
      alerts={<p>the unit's alerts go here</p>}
    />,
  );
  return { api, onClose, user: userEvent.setup() };
}

describe('UnitSheet (the map’s side sheet)', () => {
  it('names the unit and shows its status by shape and word, not colour alone', async () => {
    setup(nesslerResult());
    const sheet = screen.getByRole('dialog', { name: 'R3 · Raceway 3' });
    const badge = within(sheet).getByRole('img', { name: 'Status: Act' });
    expect(badge.textContent).toBe('◆Act');
    expect(within(sheet).getByText('Past a threshold. Someone needs to act now.')).toBeTruthy();
  });

  it('lists the latest probe values with their farm-local times, flow for a raceway, and flags a suspect value', async () => {
    setup(nesslerResult());
    const values = screen.getByTestId('latest-values');
    const cell = (q: string) => values.querySelector(`[data-quantity="${q}"]`)?.textContent ?? '';
    expect(cell('ph')).toContain('8.12');
    expect(cell('ph')).toContain('at 06:58');
    expect(cell('water_temperature')).toContain('14.3 °C');
    expect(cell('dissolved_oxygen')).toContain('6.4 mg/L');
    expect(cell('dissolved_oxygen')).toContain('suspect');
    expect(cell('flow')).toContain('310 L/min');
  });

  it('shows the latest free ammonia, the forecast afternoon peak and the Nessler interference flag', async () => {
    const { api } = setup(nesslerResult());
    const nh3 = await screen.findByTestId('free-ammonia');
    expect(nh3.textContent).toContain('0.042');
    expect(nh3.textContent).toContain('mg/L NH3');
    expect(nh3.textContent).toContain('From a TAN of 2.40 mg/L, sampled at 07:10');
    expect(within(nh3).getByTestId('forecast-peak').textContent).toContain('About 0.085 mg/L NH3 near 15:30');
    expect(within(nh3).getByTestId('result-flags').textContent).toContain(
      'a formalin treatment 48 h before this Nessler test can make Nessler results falsely high',
    );
    expect(api.calls.some((c) => c.url.endsWith(`/units/${unitIdR3}/results/latest`))).toBe(true);
  });

  it('shows NH3-N when the reader prefers it', async () => {
    mockApi({
      'GET /api/me': () => ({
        status: 200,
        body: meFixture('manager', { prefs: { temperatureUnit: 'F', concentrationUnit: 'mg/L', ammoniaBasis: 'nh3-n' } }),
      }),
      [latestPath]: () => ({ status: 200, body: { result: nesslerResult() } }),
    });
    renderWithApp(<UnitSheet farmId={farmA} timeZone="America/Chicago" unit={raceway()} onClose={() => {}} unitHref="/x" />);
    const nh3 = await screen.findByTestId('free-ammonia');
    await vi.waitFor(() => expect(nh3.textContent).toContain('mg/L NH3-N'));
    expect(nh3.textContent).toContain('0.035');
    const temp = screen.getByTestId('latest-values').querySelector('[data-quantity="water_temperature"]');
    expect(temp?.textContent).toContain('57.7 °F'); // computed: 14.3 °C × 9/5 + 32
  });

  it('says so when the unit has no kit result yet', async () => {
    setup(null);
    expect(await screen.findByText('No kit result yet for this unit.')).toBeTruthy();
  });

  it('carries the alerts it is given and a link to the unit page', async () => {
    setup(nesslerResult());
    expect(screen.getByText("the unit's alerts go here")).toBeTruthy();
    expect(screen.getByTestId('unit-page-link').getAttribute('href')).toBe(`/farms/${farmA}/units/${unitIdR3}`);
  });

  it('closes with its close button', async () => {
    const { onClose, user } = setup(nesslerResult());
    await user.click(screen.getByRole('button', { name: 'Close' }));
    expect(onClose).toHaveBeenCalledTimes(1);
  });

  it('reads in Spanish', async () => {
    await i18n.changeLanguage('es');
    setup(nesslerResult(), raceway(), 'es');
    expect(screen.getByRole('img', { name: 'Estado: Actuar' })).toBeTruthy();
    expect(screen.getByText('Últimos valores de la sonda')).toBeTruthy();
    const nh3 = await screen.findByTestId('free-ammonia');
    expect(nh3.textContent).toContain('Unos 0,085 mg/L NH3 hacia las 15:30');
  });
});
