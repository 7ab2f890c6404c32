import { describe, expect, it } from 'vitest';
import { hhmm, localParts } from '../../../shared/farm-time';
import { clearsAt, limitsAt } from '../../../shared/schemas/thresholds.schema';
import { defaultFarmSettings, type ThresholdRule } from '../../db/entities';
import { thresholdProfiles } from '../../db/seed/harrow-bend';
import { evaluateUnitFacts, farmSilenceCheck, nightAround, unitStatusOf, type FarmContext, type UnitFacts } from './alert-rules';

const HOUR = 3600_000;
const TZ = 'America/Chicago';
const catfish = thresholdProfiles.find((p) => p.species === 'channel_catfish')!;
const shrimpNh3 = thresholdProfiles.find((p) => p.species === 'whiteleg_shrimp')!.rules.find((r) => r.metric === 'nh3')!;

function facts(over: Partial<UnitFacts> = {}): UnitFacts {
  return {
    unit: { id: '00000000-0000-4000-8000-000000000001', code: 'P9', name: 'Pond 9', kind: 'pond', state: 'active', waterType: 'fresh', species: 'channel_catfish', defaultSalinityPpt: 0, testFrequencyDays: null, closeWatchUntil: null, createdAt: new Date(0) },
    profile: { id: '00000000-0000-4000-8000-000000000002', name: catfish.name, species: catfish.species, rules: catfish.rules as ThresholdRule[] },
    latestOkResult: null,
    latestResultFlags: null,
    testDue: null,
    latestNitrite: null,
    spot: {},
    probes: [],
    health: [],
    latest: {},
    doHourAgo: null,
    ranRecently: { aerator: false, pump: false },
    nightDo: null,
    ...over,
  };
}

function ctx(now: Date, over: Partial<FarmContext> = {}): FarmContext {
  return { farmId: 'f', timeZone: TZ, settings: defaultFarmSettings, now, night: nightAround(now, TZ, '18:30', '06:30'), farmSilent: false, ...over };
}

const result = (nh3MgL: number) => ({ id: 'r', waterTestId: 't', sampledAt: new Date(), tanMgL: 1, nh3MgL, nh3NMgL: nh3MgL / 1.21588, ph: 8, temperatureC: 25, salinityPpt: 0 });
const check = (f: UnitFacts, c: FarmContext, kind: string) => evaluateUnitFacts(f, c).checks.find((x) => x.kind === kind)!;

describe('hysteresis and salinity-dependent limits', () => {
  it('clears an upper concentration limit 5 % inside it and pH 0.1 inside it', () => {
    expect(clearsAt('nh3', 0.02)).toBeCloseTo(0.019, 9);
    expect(clearsAt('do_min', 4)).toBeCloseTo(4.2, 9);
    expect(clearsAt('ph_max', 8.8)).toBeCloseTo(8.7, 9);
  });

  it('interpolates the shrimp NH3-N limit between the published salinity points', () => {
    // Lin & Chen 2001 (published): safe 0.12 / 0.16 mg/L NH3-N at 15 / 25 ‰; at 18 ‰ linear (computed): 0.132, watch half (product decision).
    const lim = limitsAt(shrimpNh3, 18);
    expect(lim.act).toBeCloseTo(0.132, 9);
    expect(lim.watch).toBeCloseTo(0.066, 9);
    expect(limitsAt(shrimpNh3, 40).act).toBe(0.16);
  });

  it('raises act above the act limit, holds just inside the watch limit and clears past the margin', () => {
    const now = new Date();
    expect(check(facts({ latestOkResult: result(0.06) }), ctx(now), 'nh3_high')).toMatchObject({ verdict: 'raise', level: 'act' });
    expect(check(facts({ latestOkResult: result(0.03) }), ctx(now), 'nh3_high')).toMatchObject({ verdict: 'raise', level: 'watch' });
    expect(check(facts({ latestOkResult: result(0.0195) }), ctx(now), 'nh3_high').verdict).toBe('hold');
    expect(check(facts({ latestOkResult: result(0.01) }), ctx(now), 'nh3_high').verdict).toBe('clear');
  });
});

describe('the dawn projection', () => {
  it('projects the night decline with both methods and alarms on the lower one', () => {
    // Boyd, Romaire & Johnston 1978 via UF/IFAS FA27 (computed): 9.0 at 0 h and 7.8 at 2 h → 3.0 mg/L at 10 h; crosses 4.0 at 8.333 h.
    const dusk = new Date('2026-07-01T23:30:00Z'); // 18:30 in Chicago (CDT)
    const now = new Date(dusk.getTime() + 2 * HOUR + 5 * 60_000);
    const c = ctx(now, { night: { duskAt: dusk, dawnAt: new Date(dusk.getTime() + 10 * HOUR), isNight: true } });
    const f = facts({ nightDo: { basedOn: 'probe', points: [{ at: dusk, doMgL: 9.0 }, { at: new Date(dusk.getTime() + 2 * HOUR), doMgL: 7.8 }] } });
    const p = check(f, c, 'do_projected_low');
    expect(p.verdict).toBe('raise');
    expect(p.level).toBe('watch');
    const crosses = localParts(new Date(dusk.getTime() + (25 / 3) * HOUR), TZ);
    expect(p.message).toContain(`projected below 4.0 mg/L by ${hhmm(crosses.hour, crosses.minute)}`);
    expect((p.values.linear as { doAtDawnMgL: number }).doAtDawnMgL).toBeCloseTo(3.0, 6);
    // Madenjian, Rogers & Fast 1987 form (computed): 9.0 × (7.8 / 9.0)^5 = 4.4005 mg/L at 10 h.
    expect((p.values.logLinear as { doAtDawnMgL: number }).doAtDawnMgL).toBeCloseTo(4.4005, 3);
    expect(p.values.readingsUsed).toHaveLength(2);
  });

  it('is not evaluated by day', () => {
    const noon = new Date('2026-07-01T17:00:00Z');
    expect(check(facts(), ctx(noon), 'do_projected_low').verdict).toBe('clear');
  });
});

describe('unit status and farm silence', () => {
  it('orders act over silent over watch, and leaves calibration reminders out', () => {
    const probeIds = ['a', 'b'];
    expect(unitStatusOf({ fallow: false, activeProbeIds: probeIds, farmSilent: false, alerts: [] })).toBe('clear');
    expect(unitStatusOf({ fallow: false, activeProbeIds: probeIds, farmSilent: false, alerts: [{ kind: 'calibration_due', level: 'watch', probeId: 'a' }] })).toBe('clear');
    expect(unitStatusOf({ fallow: false, activeProbeIds: probeIds, farmSilent: false, alerts: [{ kind: 'probe_silent', level: 'watch', probeId: 'a' }] })).toBe('watch');
    const bothSilent = [{ kind: 'probe_silent', level: 'act' as const, probeId: 'a' }, { kind: 'probe_silent', level: 'watch' as const, probeId: 'b' }];
    expect(unitStatusOf({ fallow: false, activeProbeIds: probeIds, farmSilent: false, alerts: bothSilent })).toBe('silent');
    expect(unitStatusOf({ fallow: false, activeProbeIds: probeIds, farmSilent: false, alerts: [...bothSilent, { kind: 'nh3_high', level: 'act', probeId: null }] })).toBe('act');
    expect(unitStatusOf({ fallow: true, activeProbeIds: probeIds, farmSilent: true, alerts: bothSilent })).toBe('clear');
  });

  it('raises farm_silent only when every watched probe is silent', () => {
    const h = (state: 'silent' | 'ok' | 'maintenance') => ({ probeId: state, unitId: 'u', state, lastReadingAt: null, findings: [] });
    const c = { timeZone: TZ, settings: defaultFarmSettings };
    expect(farmSilenceCheck([h('silent'), h('maintenance')], c, 'Farm').verdict).toBe('raise');
    expect(farmSilenceCheck([h('silent'), h('ok')], c, 'Farm').verdict).toBe('clear');
    expect(farmSilenceCheck([h('maintenance')], c, 'Farm').verdict).toBe('clear');
  });

  it('lets a fallow unit raise nothing', () => {
    const now = new Date();
    const r = evaluateUnitFacts(facts({ unit: { ...facts().unit, state: 'fallow' }, latestOkResult: result(0.5) }), ctx(now));
    expect(r.checks).toEqual([]);
  });
});
