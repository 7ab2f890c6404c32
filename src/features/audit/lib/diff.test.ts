import { describe, expect, it } from 'vitest';
import { diffRows, show } from './diff';

describe('audit diff', () => {
  it('puts the changed fields first and marks them', () => {
    const rows = diffRows({ name: 'Pond 1', state: 'active', volumeM3: 100 }, { name: 'Pond 1', state: 'cycling', volumeM3: 120 });
    expect(rows.map((r) => [r.key, r.changed])).toEqual([
      ['state', true],
      ['volumeM3', true],
      ['name', false],
    ]);
  });

  it('marks nothing as changed on a create (no before)', () => {
    expect(diffRows(null, { code: 'P7' })).toEqual([{ key: 'code', before: undefined, after: 'P7', changed: false }]);
  });

  it('shows objects as compact JSON and cuts long text', () => {
    expect(show({ a: [1, 2] })).toBe('{"a":[1,2]}');
    expect(show('x'.repeat(300)).length).toBe(241);
    expect(show(null)).toBe('—');
  });
});
