import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { farmA, meFixture, mockApi, renderWithApp } from '@/test/render';
import { OverrideForm, type OverrideTarget } from './override-form';

const recId = '44444444-4444-4444-8444-444444444444';
const target: OverrideTarget = { recommendationId: recId, unitCode: 'P2', unitName: 'Pond 2', recommendedKg: 103.6, plannedKg: 207.1 };
const decided = {
  id: recId,
  farmId: farmA,
  unitId: '55555555-5555-4555-8555-555555555555',
  day: '2026-12-01',
  biomassKg: 8879,
  plannedKg: 207.1,
  plannedPctBw: 3,
  action: 'cut',
  cutPct: 50,
  recommendedKg: 103.6,
  reasons: [],
  inputs: {},
  ruleVersion: 'test',
  status: 'overridden',
  approvedKg: 150.5,
  overrideNote: 'Retest with salicylate read 0.02 mg/L',
  decidedById: null,
  decidedAt: '2026-12-01T14:00:00.000Z',
  computedAt: '2026-12-01T12:00:00.000Z',
  createdAt: '2026-12-01T12:00:00.000Z',
  laterProposal: null,
};
const overridePath = `POST /api/farms/${farmA}/recommendations/${recId}/override`;

function setup(handlers: Parameters<typeof mockApi>[0] = {}) {
  const api = mockApi({ 'GET /api/me': () => ({ status: 200, body: meFixture('planner') }), ...handlers });
  const onDone = vi.fn();
  renderWithApp(<OverrideForm farmId={farmA} target={target} onDone={onDone} onCancel={() => undefined} />);
  return { api, onDone, user: userEvent.setup() };
}

const describedText = (el: HTMLElement) =>
  (el.getAttribute('aria-describedby') ?? '')
    .split(' ')
    .map((id) => document.getElementById(id)?.textContent ?? '')
    .join(' ');

describe('OverrideForm', () => {
  it('starts from the recommended amount', () => {
    setup();
    expect((screen.getByLabelText('Amount to feed') as HTMLInputElement).value).toBe('103.6');
  });

  it('refuses to save without a note: the error sits beside the note field and nothing is sent', async () => {
    const { api, user, onDone } = setup();
    await user.clear(screen.getByLabelText('Amount to feed'));
    await user.type(screen.getByLabelText('Amount to feed'), '150');
    await user.click(screen.getByRole('button', { name: 'Save this amount' }));

    const note = screen.getByLabelText('Why not the recommendation?');
    await waitFor(() => expect(note.getAttribute('aria-invalid')).toBe('true'));
    expect(describedText(note)).toContain('Say why you are not following the recommendation');
    expect(api.calls.filter((c) => c.url.includes('/override'))).toHaveLength(0);
    expect(onDone).not.toHaveBeenCalled();
  });

  it('a note of only spaces is not a note', async () => {
    const { api, user } = setup();
    await user.type(screen.getByLabelText('Why not the recommendation?'), '    ');
    await user.click(screen.getByRole('button', { name: 'Save this amount' }));
    await waitFor(() => expect(screen.getByLabelText('Why not the recommendation?').getAttribute('aria-invalid')).toBe('true'));
    expect(api.calls.filter((c) => c.url.includes('/override'))).toHaveLength(0);
  });

  it('asks for an amount when the field is emptied', async () => {
    const { user } = setup();
    await user.clear(screen.getByLabelText('Amount to feed'));
    await user.type(screen.getByLabelText('Why not the recommendation?'), 'Fish feeding well');
    await user.click(screen.getByRole('button', { name: 'Save this amount' }));
    const amount = screen.getByLabelText('Amount to feed');
    await waitFor(() => expect(amount.getAttribute('aria-invalid')).toBe('true'));
    expect(describedText(amount)).toContain('Enter the amount to feed in kg.');
  });

  it('sends the amount (a comma works as the decimal mark) and the note, then closes', async () => {
    const { api, user, onDone } = setup({
      [overridePath]: () => ({ status: 200, body: decided }),
    });
    await user.clear(screen.getByLabelText('Amount to feed'));
    await user.type(screen.getByLabelText('Amount to feed'), '150,5');
    await user.type(screen.getByLabelText('Why not the recommendation?'), 'Retest with salicylate read 0.02 mg/L');
    await user.click(screen.getByRole('button', { name: 'Save this amount' }));
    await waitFor(() => expect(api.calls.some((c) => c.url.includes('/override'))).toBe(true));
    const sent = api.calls.find((c) => c.url.includes('/override'));
    expect(sent?.method).toBe('POST');
    expect(sent?.body).toEqual({ approvedKg: 150.5, note: 'Retest with salicylate read 0.02 mg/L' });
    await waitFor(() => expect(onDone).toHaveBeenCalledTimes(1));
  });

  it("puts the server's field error beside the note", async () => {
    const { user, onDone } = setup({
      [overridePath]: () => ({
        status: 400,
        body: {
          error: {
            code: 'validation_failed',
            message: 'Invalid body',
            details: { fieldErrors: { note: ['Say why the recommendation is overridden'] } },
          },
        },
      }),
    });
    await user.type(screen.getByLabelText('Why not the recommendation?'), 'abc');
    await user.click(screen.getByRole('button', { name: 'Save this amount' }));
    const note = screen.getByLabelText('Why not the recommendation?');
    await waitFor(() => expect(note.getAttribute('aria-invalid')).toBe('true'));
    expect(describedText(note)).toContain('Say why the recommendation is overridden');
    expect(onDone).not.toHaveBeenCalled();
  });
});
