import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { farmA, meFixture, mockApi, renderWithApp } from '@/test/render';
import { StockEventForm } from './stock-event-form';

const unitId = '88888888-8888-4888-8888-888888888888';
const path = `POST /api/farms/${farmA}/units/${unitId}/stock-events`;

function setup(handlers: Parameters<typeof mockApi>[0] = {}) {
  const api = mockApi({ 'GET /api/me': () => ({ status: 200, body: meFixture('planner') }), ...handlers });
  const onSaved = vi.fn();
  renderWithApp(
    <StockEventForm farmId={farmA} unit={{ id: unitId, code: 'P6' }} otherUnits={[]} timeZone="America/Chicago" onSaved={onSaved} />,
  );
  return { api, onSaved, user: userEvent.setup() };
}

const described = (el: HTMLElement) =>
  (el.getAttribute('aria-describedby') ?? '')
    .split(' ')
    .map((id) => document.getElementById(id)?.textContent ?? '')
    .join(' ');

describe('StockEventForm', () => {
  it("puts the shared schema's rule for the kind of event beside the field, and sends nothing", async () => {
    const { api, user } = setup();
    await user.click(screen.getByRole('radio', { name: 'Harvest' }));
    await user.click(screen.getByRole('button', { name: 'Save' }));
    const count = screen.getByLabelText('Number of fish');
    await waitFor(() => expect(count.getAttribute('aria-invalid')).toBe('true'));
    expect(described(count)).toContain('Give the number of fish harvested.');
    expect(api.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
  });

  it('shows the refusal when the unit is in a withdrawal period, with the date and the treatment', async () => {
    const { user, onSaved } = setup({
      [path]: () => ({
        status: 409,
        body: {
          error: {
            code: 'in_withdrawal',
            message: 'Harvest refused: P6 is in a withdrawal period until 2026-12-20.',
            details: {
              withdrawal: {
                inWithdrawal: true,
                endsAt: '2026-12-21T00:51:20.000Z',
                reason: 'Withdrawal after oxytetracycline feed from 2026-11-30: 21 days',
              },
            },
          },
        },
      }),
    });
    await user.click(screen.getByRole('radio', { name: 'Harvest' }));
    await user.type(screen.getByLabelText('Number of fish'), '1500');
    await user.click(screen.getByRole('button', { name: 'Save' }));
    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain('Harvest refused');
    expect(alert.textContent).toContain('P6 is in a withdrawal period after a treatment until Dec 20, 2026');
    expect(alert.textContent).toContain('Withdrawal after oxytetracycline feed');
    expect(onSaved).not.toHaveBeenCalled();
  });
});
