import { describe, expect, it } from 'vitest';
import { DAY_MS, HOUR_MS } from '../models/clock';
import { ScenarioParamError, createScenario, parseScenarioText, scenarioNames, scenarios } from '.';

const start = Date.parse('2025-07-01T12:00:00Z');

describe('scenario strings', () => {
  it('every listed scenario has a definition with a summary', () => {
    for (const name of scenarioNames) expect(scenarios[name].summary.length).toBeGreaterThan(5);
  });

  it('parses a name with parameters, keeping colons inside ISO times', () => {
    expect(parseScenarioText('flow-cut:at=2025-07-01T14:00:00Z,fraction=0.12')).toEqual({
      name: 'flow-cut',
      params: { at: '2025-07-01T14:00:00Z', fraction: '0.12' },
    });
  });

  it('rejects unknown scenarios, unknown parameters and bad values with a clear message', () => {
    expect(() => parseScenarioText('outage')).toThrow(/unknown scenario "outage"/);
    expect(() => parseScenarioText('drift:rate=1')).toThrow(/no parameter "rate"; known: phPerDay, from/);
    expect(() => createScenario('spike:probability=2', { startMs: start })).toThrow(ScenarioParamError);
    expect(() => createScenario('flow-cut:at=soon', { startMs: start })).toThrow(/ISO time/);
  });

  it('an empty or missing scenario is steady', () => {
    expect(createScenario(undefined, { startMs: start }).name).toBe('steady');
    expect(createScenario(' ', { startMs: start }).name).toBe('steady');
  });
});

describe('scenario effects', () => {
  it('drift grows the pH offset by 0.02 per day by default', () => {
    const drift = createScenario('drift', { startMs: start });
    expect(drift.phOffset(start)).toBe(0);
    expect(drift.phOffset(start + 10 * DAY_MS)).toBeCloseTo(0.2, 10);
  });

  it('dropout takes the link down for its minutes and repeats', () => {
    const dropout = createScenario('dropout:minutes=20,at=+5m,every=6h', { startMs: start });
    expect(dropout.offline(start)).toBe(false);
    expect(dropout.offline(start + 6 * 60_000)).toBe(true);
    expect(dropout.offline(start + 26 * 60_000)).toBe(false);
    expect(dropout.offline(start + 6 * HOUR_MS + 10 * 60_000)).toBe(true);
  });

  it('flow-cut ramps the flow down to its fraction and can restore it', () => {
    const cut = createScenario('flow-cut:at=+10m,fraction=0.2,ramp=10m,restore=2h', { startMs: start });
    expect(cut.flowFactor(start)).toBe(1);
    expect(cut.flowFactor(start + 15 * 60_000)).toBeCloseTo(0.6, 10);
    expect(cut.flowFactor(start + HOUR_MS)).toBeCloseTo(0.2, 10);
    expect(cut.flowFactor(start + 3 * HOUR_MS)).toBe(1);
  });

  it('HH:MM times mean the next such farm-local time after the start', () => {
    // 12:00Z is 07:00 in Chicago (CDT); 14:00 local is 19:00Z the same day.
    const cut = createScenario('flow-cut:at=14:00,ramp=1s', { startMs: start, timeZone: 'America/Chicago' });
    expect(cut.flowFactor(Date.parse('2025-07-01T18:59:00Z'))).toBe(1);
    expect(cut.flowFactor(Date.parse('2025-07-01T19:01:00Z'))).toBeCloseTo(0.15, 10);
  });

  it('burst marks load-test mode and cycling thins the algae', () => {
    expect(createScenario('burst', { startMs: start }).burst).toBe(true);
    expect(createScenario('cycling', { startMs: start }).algaeFactor).toBe(0.35);
  });
});
