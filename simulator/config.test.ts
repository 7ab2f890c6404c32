import { describe, expect, it } from 'vitest';
import { helpText, parseConfig } from './config';

describe('simulator configuration', () => {
  it('uses the defaults when no flags or environment are given', () => {
    const result = parseConfig([], {});
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.config).toMatchObject({
      credentialsFile: '.data/probe-credentials.json',
      brokerUrl: undefined,
      speed: 1,
      once: false,
      backfillHours: 0,
      seed: 1,
      reloadSeconds: 30,
      bufferCapacity: 10_000,
      logLevel: 'info',
    });
  });

  it('reads the environment, and flags win over it', () => {
    const env = { PROBE_CREDENTIALS_FILE: '/tmp/p.json', MQTT_BROKER_URL: 'mqtt://10.0.0.1:1883', FARM_TIME_ZONE: 'America/Chicago' };
    const fromEnv = parseConfig([], env);
    expect(fromEnv.ok && fromEnv.config).toMatchObject({
      credentialsFile: '/tmp/p.json',
      brokerUrl: 'mqtt://10.0.0.1:1883',
      timeZone: 'America/Chicago',
    });
    const fromFlags = parseConfig(['--broker', 'mqtt://127.0.0.1:18830', '--credentials', 'x.json'], env);
    expect(fromFlags.ok && fromFlags.config).toMatchObject({ credentialsFile: 'x.json', brokerUrl: 'mqtt://127.0.0.1:18830' });
  });

  it('parses every flag', () => {
    const result = parseConfig(
      [
        '--scenario',
        'flow-cut:at=14:00',
        '--probes',
        '4',
        '--only',
        'pond-1, pond-2',
        '--interval',
        '0.5',
        '--speed',
        '60',
        '--once',
        '--backfill',
        '6',
        '--seed',
        'harrow',
        '--tz',
        'UTC',
        '--lat',
        '35.2',
        '--lon',
        '-91.7',
        '--fahrenheit',
        'pond-3',
        '--verbose',
      ],
      {},
    );
    expect(result.ok && result.config).toMatchObject({
      scenario: 'flow-cut:at=14:00',
      probes: 4,
      only: ['pond-1', 'pond-2'],
      intervalSeconds: 0.5,
      speed: 60,
      once: true,
      backfillHours: 6,
      seed: 'harrow',
      timeZone: 'UTC',
      latitude: 35.2,
      longitude: -91.7,
      fahrenheit: ['pond-3'],
      logLevel: 'debug',
    });
  });

  it('takes --backfill without a value as 24 hours', () => {
    const result = parseConfig(['--backfill', '--once'], {});
    expect(result.ok && result.config.backfillHours).toBe(24);
    expect(result.ok && result.config.once).toBe(true);
  });

  it('lists every problem at once', () => {
    const result = parseConfig(['--probes', '0', '--interval', 'fast', '--scenario', 'outage', '--tz', 'Mars/Olympus'], {});
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors.join('\n')).toMatch(/--probes/);
    expect(result.errors.join('\n')).toMatch(/--interval/);
    expect(result.errors.join('\n')).toMatch(/unknown scenario/);
    expect(result.errors.join('\n')).toMatch(/unknown time zone/);
  });

  it('takes a time zone and position per farm with --farm, and names a bad one', () => {
    const result = parseConfig(['--farm', 'harrow-bend=America/Chicago@33.264,-91.029', '--farm', 'cedar-flats=America/Denver'], {});
    expect(result.ok && result.config.farms).toEqual({
      'harrow-bend': { timeZone: 'America/Chicago', latitude: 33.264, longitude: -91.029 },
      'cedar-flats': { timeZone: 'America/Denver' },
    });
    const bad = parseConfig(['--farm', 'harrow-bend=Nowhere/Land'], {});
    expect(!bad.ok && bad.errors).toEqual(['--farm harrow-bend: unknown time zone "Nowhere/Land"']);
  });

  it('rejects unknown flags and a latitude without a longitude', () => {
    expect(parseConfig(['--bogus'], {}).ok).toBe(false);
    const result = parseConfig(['--lat', '30'], {});
    expect(!result.ok && result.errors).toEqual(['--lat and --lon go together']);
  });

  it('help lists every scenario', () => {
    for (const name of ['steady', 'cycling', 'dropout', 'drift', 'spike', 'flatline', 'burst', 'flow-cut'])
      expect(helpText()).toContain(name);
  });
});
