import { describe, expect, it } from 'vitest';
import { nh3Levels } from './levels';
import { decideFeed, defaultFeedRule, isRising, mergeFeedRule, type FeedSignals } from './rule';

const clear = (over: Partial<FeedSignals> = {}): FeedSignals => ({
  species: 'channel_catfish',
  plannedKg: 100,
  plan: { status: 'ok', text: 'Water 26 °C: 3 % BW daily → 100 kg' },
  oxygen: { criticalMgL: 2, latest: { mgL: 6, localTime: '10:00' }, dawnLow: { mgL: 4, localTime: '06:10' }, openAlerts: [] },
  ammonia: {
    watchNh3MgL: 0.02,
    actNh3MgL: 0.05,
    latest: { nh3MgL: 0.01, localTime: '09:00', day: '2026-06-10', ageHours: 2 },
    forecast: { nh3MgL: 0.015, localTime: '15:00', day: '2026-06-10' },
    recentNh3MgL: [0.01, 0.01, 0.01],
  },
  treatment: null,
  dieOff: null,
  notes: [],
  raceway: null,
  ...over,
});
const ammonia = (a: Partial<FeedSignals['ammonia']>) => ({ ...clear().ammonia, ...a });

describe('the feed-cut rule', () => {
  it('feeds the planned ration when nothing calls for a cut', () => {
    const d = decideFeed(clear(), defaultFeedRule);
    expect(d).toMatchObject({ action: 'feed', cutPct: 0, recommendedKg: 100 });
    expect(d.reasons[0]?.code).toBe('full_ration');
  });

  it('cuts 50 % when the forecast peak reaches the act level, and says so in words', () => {
    const d = decideFeed(clear({ ammonia: ammonia({ forecast: { nh3MgL: 0.061, localTime: '15:00', day: '2026-06-10' } }) }), defaultFeedRule);
    expect(d).toMatchObject({ action: 'cut', cutPct: 50, recommendedKg: 50 });
    expect(d.reasons.find((r) => r.code === 'nh3_act')?.text).toBe('NH3 0.061 mg/L forecast at 15:00; act level 0.050; cut 50 %');
    expect(d.reasons.find((r) => r.code === 'nh3_act')?.source).toMatch(/SRAC 4603/);
  });

  it('cuts 25 % at the watch level', () => {
    const d = decideFeed(clear({ ammonia: ammonia({ latest: { nh3MgL: 0.03, localTime: '09:00', day: '2026-06-10', ageHours: 2 }, forecast: null }) }), defaultFeedRule);
    expect(d).toMatchObject({ action: 'cut', cutPct: 25, recommendedKg: 75 });
    expect(d.reasons[0]?.text).toMatch(/NH3 0\.030 mg\/L measured at 09:00; watch level 0\.020; cut 25 %/);
  });

  it('cuts more when the last three results rise', () => {
    const d = decideFeed(
      clear({ ammonia: ammonia({ latest: { nh3MgL: 0.03, localTime: '09:00', day: '2026-06-10', ageHours: 2 }, forecast: null, recentNh3MgL: [0.012, 0.02, 0.03] }) }),
      defaultFeedRule,
    );
    expect(d.cutPct).toBe(50);
    expect(d.reasons.find((r) => r.code === 'nh3_rising')?.text).toMatch(/rising over the last 3 results \(0\.012 → 0\.020 → 0\.030 mg\/L\); cut 25 % more/);
  });

  it('never cuts more than the ammonia maximum for ammonia alone', () => {
    const d = decideFeed(clear({ ammonia: ammonia({ latest: { nh3MgL: 0.09, localTime: '09:00', day: '2026-06-10', ageHours: 2 }, recentNh3MgL: [0.03, 0.06, 0.09] }) }), defaultFeedRule);
    expect(d.cutPct).toBe(75);
  });

  it('keeps the cut on a flagged kit result and passes the flag on', () => {
    const flagged = { nh3MgL: 0.06, localTime: '09:00', day: '2026-06-10', ageHours: 2, flags: ['May read high — re-test with a salicylate kit.'] };
    const d = decideFeed(clear({ ammonia: ammonia({ latest: flagged }) }), defaultFeedRule);
    expect(d.cutPct).toBe(50);
    expect(d.reasons.find((r) => r.code === 'nh3_result_flagged')?.text).toBe('About the latest result: May read high — re-test with a salicylate kit.');
  });

  it('reports an old result without acting on it', () => {
    const d = decideFeed(clear({ ammonia: ammonia({ latest: { nh3MgL: 0.09, localTime: '09:00', day: '2026-05-01', ageHours: 24 * 20 } }) }), defaultFeedRule);
    expect(d.action).toBe('feed');
    expect(d.reasons.map((r) => r.code)).toContain('ammonia_result_old');
  });

  it('withholds while DO is below the species critical level', () => {
    const d = decideFeed(clear({ oxygen: { criticalMgL: 2, latest: { mgL: 1.6, localTime: '05:50' }, dawnLow: { mgL: 1.6, localTime: '05:50' }, openAlerts: [] } }), defaultFeedRule);
    expect(d).toMatchObject({ action: 'withhold', cutPct: 100, recommendedKg: 0 });
    expect(d.reasons[0]?.text).toBe('DO 1.6 mg/L at 05:50, below the 2.0 mg/L critical level for channel catfish; withhold until it recovers');
  });

  it('withholds after a low dawn until DO is back a margin above the critical level, then feeds', () => {
    const low = { criticalMgL: 2, dawnLow: { mgL: 1.5, localTime: '06:00' }, openAlerts: [] };
    expect(decideFeed(clear({ oxygen: { ...low, latest: { mgL: 2.5, localTime: '08:00' } } }), defaultFeedRule).action).toBe('withhold');
    const back = decideFeed(clear({ oxygen: { ...low, latest: { mgL: 4.2, localTime: '11:00' } } }), defaultFeedRule);
    expect(back.action).toBe('feed');
    expect(back.reasons.map((r) => r.code)).toContain('do_recovered');
  });

  it('withholds on an open act-level DO alert', () => {
    const d = decideFeed(clear({ oxygen: { ...clear().oxygen, openAlerts: [{ kind: 'do_projected_low', level: 'act', title: 'DO projected below 3 mg/L at dawn' }] } }), defaultFeedRule);
    expect(d.action).toBe('withhold');
  });

  it('withholds outside the feeding band and on a rest day', () => {
    expect(decideFeed(clear({ plannedKg: 0, plan: { status: 'out_of_band', text: 'too cold' } }), defaultFeedRule)).toMatchObject({ action: 'withhold', recommendedKg: 0 });
    expect(decideFeed(clear({ plannedKg: 0, plan: { status: 'not_feeding_day', text: 'rest day' } }), defaultFeedRule).reasons[0]?.code).toBe('not_feeding_day');
  });

  it('skips a day within 24 h of a treatment and cuts 25 % within 48 h', () => {
    expect(decideFeed(clear({ treatment: { label: 'Formalin bath', hoursSinceEnd: 6 } }), defaultFeedRule).action).toBe('withhold');
    expect(decideFeed(clear({ treatment: { label: 'Formalin bath', hoursSinceEnd: 30 } }), defaultFeedRule)).toMatchObject({ action: 'cut', cutPct: 25, recommendedKg: 75 });
    expect(decideFeed(clear({ treatment: { label: 'Formalin bath', hoursSinceEnd: 60 } }), defaultFeedRule).action).toBe('feed');
  });

  it('withholds for a suspected die-off', () => {
    const d = decideFeed(clear({ dieOff: { kind: 'dead_fish', localTime: '07:15', count: 12 } }), defaultFeedRule);
    expect(d.action).toBe('withhold');
    expect(d.reasons[0]?.text).toBe('Dead fish seen at 07:15 today (12): suspected die-off; withhold until the cause is known');
  });

  it('applies the largest single cut, not the sum', () => {
    const d = decideFeed(
      clear({ treatment: { label: 'Salt', hoursSinceEnd: 30 }, ammonia: ammonia({ latest: { nh3MgL: 0.06, localTime: '09:00', day: '2026-06-10', ageHours: 2 } }) }),
      defaultFeedRule,
    );
    expect(d.cutPct).toBe(50);
  });

  it('caps a raceway ration at the most feed that keeps NH3 under target, naming the reduced flow', () => {
    const d = decideFeed(
      clear({
        species: 'rainbow_trout',
        plannedKg: 8,
        oxygen: { criticalMgL: 5, latest: { mgL: 7, localTime: '10:00' }, dawnLow: null, openAlerts: [] },
        ammonia: ammonia({ watchNh3MgL: 0.0125, actNh3MgL: 0.025, latest: { nh3MgL: 0.01, localTime: '09:00', day: '2026-06-10', ageHours: 1 }, forecast: null }),
        raceway: { flowLpm: 390, flowSource: 'probe', designFlowLpm: 2600, plannedNh3MgL: 0.04, plannedTanRiseMgL: 0.9, targetNh3MgL: 0.025, maxFeedKg: 5, pH: 7.9, temperatureC: 15 },
      }),
      defaultFeedRule,
    );
    expect(d.action).toBe('cut');
    expect(d.recommendedKg).toBe(5);
    expect(d.cutPct).toBe(37.5);
    expect(d.reasons.find((r) => r.code === 'flow_reduced')?.text).toBe('Flow 390 L/min (probe), 15 % of the 2,600 L/min design; cut 25 %');
    expect(d.reasons.find((r) => r.code === 'ammonia_load')?.text).toMatch(/over the 0\.025 mg\/L target; at most 5\.0 kg keeps it under; flow is reduced vs design/);
  });
});

describe('rule configuration', () => {
  it('lays farm overrides over the defaults key by key', () => {
    const rule = mergeFeedRule({ ammonia: { actCutPct: 60 }, raceway: { inletTanMgL: 0.1 } });
    expect(rule.ammonia.actCutPct).toBe(60);
    expect(rule.ammonia.watchCutPct).toBe(25);
    expect(rule.raceway.inletTanMgL).toBe(0.1);
    expect(rule.criticalDoMgL.rainbow_trout).toBe(5);
  });

  it('calls a series rising only when every step goes up', () => {
    expect(isRising([0.01, 0.02, 0.03], 3)).toBe(true);
    expect(isRising([0.01, 0.03, 0.02], 3)).toBe(false);
    expect(isRising([0.02, 0.03], 3)).toBe(false);
  });
});

describe('ammonia levels of a threshold profile', () => {
  it('converts NH3-N levels to NH3 and interpolates them over salinity', () => {
    // Lin & Chen 2001: safe 0.12 / 0.16 mg/L NH3-N at 15 / 25 ‰ (published); at 20 ‰ 0.14 (computed).
    const levels = nh3Levels(
      [{ metric: 'nh3', watch: 0.08, act: 0.16, basis: 'mg/L NH3-N', source: 'Lin & Chen 2001', bySalinity: [{ salinityPpt: 15, act: 0.12 }, { salinityPpt: 25, act: 0.16 }] }],
      20,
    )!;
    expect(levels.actNh3MgL).toBeCloseTo(0.14 * 1.21588, 10);
    expect(levels.watchNh3MgL).toBeCloseTo(0.07 * 1.21588, 10);
  });

  it('keeps NH3 levels as they are', () => {
    expect(nh3Levels([{ metric: 'nh3', watch: 0.0125, act: 0.025, basis: 'mg/L NH3', source: 'EIFAC' }], 0)).toMatchObject({ watchNh3MgL: 0.0125, actNh3MgL: 0.025 });
  });
});
