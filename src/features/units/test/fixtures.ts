import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import type { FreeAmmoniaResultDto } from '@shared/schemas/water-tests.schema';

// Invented values for component tests (farm time zone America/Chicago: 12:58Z = 06:58 local in winter).
export const unitIdR3 = '44444444-4444-4444-8444-444444444444';
export const probeIdR3 = '55555555-5555-4555-8555-555555555555';

export function raceway(overrides: Partial<UnitStatusDto> = {}): UnitStatusDto {
  const at = '2026-12-01T12:58:00.000Z';
  return {
    id: unitIdR3,
    code: 'R3',
    name: 'Raceway 3',
    kind: 'raceway',
    state: 'active',
    waterType: 'fresh',
    walkOrder: 8,
    outline: null,
    latest: {
      ph: { value: 8.12, unit: 'pH', at, quality: 'good', probeId: probeIdR3 },
      water_temperature: { value: 14.3, unit: 'C', at, quality: 'good', probeId: probeIdR3 },
      dissolved_oxygen: { value: 6.4, unit: 'mg/L', at, quality: 'suspect', probeId: probeIdR3 },
      flow: { value: 310, unit: 'L/min', at, quality: 'good', probeId: probeIdR3 },
    },
    lastReadingAt: at,
    status: 'act',
    latestResult: null,
    ...overrides,
  };
}

export function nesslerResult(overrides: Partial<FreeAmmoniaResultDto> = {}): FreeAmmoniaResultDto {
  return {
    id: '66666666-6666-4666-8666-666666666666',
    waterTestId: '77777777-7777-4777-8777-777777777777',
    unitId: unitIdR3,
    sampledAt: '2026-12-01T13:10:00.000Z',
    status: 'ok',
    tanMgL: 2.4,
    nh3NMgL: 0.0345,
    nh3MgL: 0.042,
    fraction: 0.0144,
    pKa: 9.96,
    method: 'emerson1975',
    pHScale: 'nbs',
    pH: 8.12,
    temperatureC: 14.3,
    salinityPpt: 0,
    provenance: {
      values: [
        {
          quantity: 'ph',
          value: 8.12,
          source: 'probe_interpolated',
          probeId: probeIdR3,
          probeLabel: 'R3 sonde',
          readings: [
            { at: '2026-12-01T13:09:00.000Z', value: 8.11 },
            { at: '2026-12-01T13:11:00.000Z', value: 8.13 },
          ],
        },
        { quantity: 'water_temperature', value: 14.3, source: 'handheld', probeId: null, probeLabel: null, readings: [] },
        { quantity: 'salinity', value: 0, source: 'unit_default', probeId: null, probeLabel: null, readings: [] },
      ],
      windowMinutes: 30,
      missing: [],
    },
    flags: [
      {
        code: 'nessler_interference',
        message:
          'May read high — re-test with a salicylate kit. A formalin treatment 48 h before this Nessler test can make Nessler results falsely high.',
      },
    ],
    forecastPeak: {
      nh3NMgL: 0.07,
      nh3MgL: 0.085,
      at: '2026-12-01T21:30:00.000Z',
      localTime: '15:30',
      basedOnHours: 72,
      morningTestNote: 'x',
    },
    computedAt: '2026-12-01T13:10:05.000Z',
    testVersion: 1,
    ...overrides,
  };
}
