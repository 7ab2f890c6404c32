import { describe, expect, it } from 'vitest';
import { ChemistryInputError, projectDawnOxygen } from './index';

const HOUR = 3_600_000;
const dusk = Date.parse('2026-07-01T19:00:00.000Z');

describe('projectDawnOxygen', () => {
  it('projects 9.0 at 0 h and 7.8 at 2 h to 3.0 mg/L at 10 h, crossing 4.0 at 8.333 h', () => {
    // Boyd, Romaire & Johnston 1978 linear two-point method via UF/IFAS FA27 (computed)
    const result = projectDawnOxygen({
      readings: [
        { at: dusk, doMgL: 9.0 },
        { at: dusk + 2 * HOUR, doMgL: 7.8 },
      ],
      dawnAt: dusk + 10 * HOUR,
      thresholdMgL: 4,
    });
    expect(result.linear.doAtDawnMgL).toBeCloseTo(3.0, 10);
    expect(result.linear.crossesAt).not.toBeNull();
    expect(((result.linear.crossesAt ?? 0) - dusk) / HOUR).toBeCloseTo(8.333, 3);
  });

  it('projects the same readings log-linearly to 9.0 × (7.8/9.0)^5 at 10 h, above 4.0 all night', () => {
    // Madenjian, Rogers & Fast 1987 log-linear form (from memory); value at 10 h (computed)
    const result = projectDawnOxygen({
      readings: [
        { at: dusk, doMgL: 9.0 },
        { at: dusk + 2 * HOUR, doMgL: 7.8 },
      ],
      dawnAt: dusk + 10 * HOUR,
      thresholdMgL: 4,
    });
    expect(result.logLinear.doAtDawnMgL).toBeCloseTo(9.0 * (7.8 / 9.0) ** 5, 10);
    expect(result.logLinear.crossesAt).toBeNull();
    expect(result.lower).toBe('linear');
    expect(result.doAtDawnMgL).toBeCloseTo(3.0, 10);
  });

  it('answers in ISO strings when dawn is given as an ISO string', () => {
    // Boyd, Romaire & Johnston 1978 via UF/IFAS FA27 (computed): 8 h 20 min after the first reading
    const result = projectDawnOxygen({
      readings: [
        { at: '2026-07-01T19:00:00.000Z', doMgL: 9.0 },
        { at: '2026-07-01T21:00:00.000Z', doMgL: 7.8 },
      ],
      dawnAt: '2026-07-02T05:00:00.000Z',
      thresholdMgL: 4,
    });
    expect(result.linear.crossesAt).toBe('2026-07-02T03:20:00.000Z');
  });

  it('fits a least-squares line to more than two readings and drops readings before dusk', () => {
    // least-squares fit over readings since dusk, husbandry.md §1 (computed): points on an exact line
    const readings = [
      { at: dusk - HOUR, doMgL: 12 }, // afternoon, still photosynthesising
      { at: dusk, doMgL: 9.0 },
      { at: dusk + HOUR, doMgL: 8.4 },
      { at: dusk + 2 * HOUR, doMgL: 7.8 },
      { at: dusk + 3 * HOUR, doMgL: 7.2 },
    ];
    const result = projectDawnOxygen({ readings, dawnAt: dusk + 10 * HOUR, thresholdMgL: 4, duskAt: dusk });
    expect(result.readingsUsed).toHaveLength(4);
    expect(result.readingsUsed[0]).toBe(readings[1]);
    expect(result.linear.doAtDawnMgL).toBeCloseTo(3.0, 10);
  });

  it('fits ln DO by least squares, so exponential readings project exactly', () => {
    // Madenjian, Rogers & Fast 1987 log-linear form fitted by least squares (computed)
    const readings = [0, 1, 2, 3].map((h) => ({ at: new Date(dusk + h * HOUR), doMgL: 10 * 0.9 ** h }));
    const result = projectDawnOxygen({ readings, dawnAt: new Date(dusk + 8 * HOUR), thresholdMgL: 5 });
    expect(result.logLinear.doAtDawnMgL).toBeCloseTo(10 * 0.9 ** 8, 10);
    const crossing = result.logLinear.crossesAt;
    expect(crossing).toBeInstanceOf(Date);
    expect(((crossing?.getTime() ?? 0) - dusk) / HOUR).toBeCloseTo(Math.log(0.5) / Math.log(0.9), 5);
  });

  it('never projects below 0 mg/L', () => {
    // DO cannot be negative (common practice, no source)
    const result = projectDawnOxygen({
      readings: [
        { at: dusk, doMgL: 6 },
        { at: dusk + HOUR, doMgL: 4 },
      ],
      dawnAt: dusk + 10 * HOUR,
      thresholdMgL: 2,
    });
    expect(result.linear.doAtDawnMgL).toBe(0);
    expect(result.doAtDawnMgL).toBe(0);
  });

  it('needs two readings at different times and DO above 0', () => {
    // log-linear form needs DO > 0 (computed)
    expect(() =>
      projectDawnOxygen({ readings: [{ at: dusk, doMgL: 8 }], dawnAt: dusk + HOUR, thresholdMgL: 4 }),
    ).toThrow(RangeError);
    expect(() =>
      projectDawnOxygen({
        readings: [
          { at: dusk, doMgL: 8 },
          { at: dusk + HOUR, doMgL: 0 },
        ],
        dawnAt: dusk + 10 * HOUR,
        thresholdMgL: 4,
      }),
    ).toThrow(ChemistryInputError);
  });
});
