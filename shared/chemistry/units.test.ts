// Tests for shared/units.ts (kept here so they run with the chemistry suite).
import { describe, expect, it } from 'vitest';
import { quantities } from '../schemas/mqtt.schema';
import {
  ChemistryInputError,
  alkalinityMeqLToMgLCaCO3,
  celsiusToFahrenheit,
  fahrenheitToCelsius,
  gpmToLpm,
  isPhysicallyPossible,
  isPlausibleStep,
  lpmToGpm,
  lpmToM3PerHour,
  m3PerHourToLpm,
  mgLToPpm,
  nh3NToNh3MgL,
  nh3ToNh3NMgL,
  nh4NToNh4MgL,
  nh4ToNh4NMgL,
  no2NToNo2MgL,
  no2ToNo2NMgL,
  no3NToNo3MgL,
  no3ToNo3NMgL,
  oxygenMlLToMgL,
  physicalLimits,
  plausibleStepPerMinute,
  pptToPsu,
  toCanonicalUnit,
} from './index';

// Molar masses (IUPAC standard atomic weights): N 14.0067, H 1.00794, O 15.9994.
const N = 14.0067;
const H = 1.00794;
const O = 15.9994;

describe('nitrogen-species conversions', () => {
  it('match the molar-mass ratios to five decimals', () => {
    // molar masses, water-chemistry.md §7 (computed)
    expect(nh3NToNh3MgL({ nh3NMgL: 1 })).toBeCloseTo((N + 3 * H) / N, 5);
    expect(nh4NToNh4MgL({ nh4NMgL: 1 })).toBeCloseTo((N + 4 * H) / N, 4);
    expect(no2NToNo2MgL({ no2NMgL: 1 })).toBeCloseTo((N + 2 * O) / N, 5);
    expect(no3NToNo3MgL({ no3NMgL: 1 })).toBeCloseTo((N + 3 * O) / N, 5);
  });

  it('round-trip', () => {
    // inverse conversions (computed)
    expect(nh3ToNh3NMgL({ nh3MgL: nh3NToNh3MgL({ nh3NMgL: 0.7 }) })).toBeCloseTo(0.7, 12);
    expect(nh4ToNh4NMgL({ nh4MgL: nh4NToNh4MgL({ nh4NMgL: 0.7 }) })).toBeCloseTo(0.7, 12);
    expect(no2ToNo2NMgL({ no2MgL: no2NToNo2MgL({ no2NMgL: 0.7 }) })).toBeCloseTo(0.7, 12);
    expect(no3ToNo3NMgL({ no3MgL: no3NToNo3MgL({ no3NMgL: 0.7 }) })).toBeCloseTo(0.7, 12);
  });

  it('reject negative concentrations', () => {
    expect(() => nh3NToNh3MgL({ nh3NMgL: -1 })).toThrow(ChemistryInputError);
  });
});

describe('other conversions', () => {
  it('convert temperature, flow, alkalinity and oxygen volumes', () => {
    // exact unit definitions; CaCO3 50.04 mg/meq (computed); O2 1.42905 mg/mL (from memory)
    expect(celsiusToFahrenheit({ temperatureC: 100 })).toBe(212);
    expect(fahrenheitToCelsius({ temperatureF: 32 })).toBe(0);
    expect(fahrenheitToCelsius({ temperatureF: -40 })).toBe(-40);
    expect(gpmToLpm({ flowGpm: 1 })).toBeCloseTo(3.785411784, 12);
    expect(lpmToGpm({ flowLpm: gpmToLpm({ flowGpm: 500 }) })).toBeCloseTo(500, 10);
    expect(m3PerHourToLpm({ flowM3PerHour: 6 })).toBeCloseTo(100, 12);
    expect(lpmToM3PerHour({ flowLpm: 100 })).toBeCloseTo(6, 12);
    expect(alkalinityMeqLToMgLCaCO3({ alkalinityMeqL: 2 })).toBeCloseTo(100.08, 10);
    expect(oxygenMlLToMgL({ oxygenMlL: 7 })).toBeCloseTo(10.00335, 5);
  });

  it('treat ppt and psu, and mg/L and ppm, as equal', () => {
    // practical equivalence (common practice, no source)
    expect(pptToPsu({ salinityPpt: 35 })).toBe(35);
    expect(mgLToPpm({ mgL: 4.2 })).toBe(4.2);
  });

  it('bring every probe unit to the canonical unit of mqtt.schema.ts', () => {
    // exact unit definitions (computed)
    expect(toCanonicalUnit({ quantity: 'water_temperature', value: 212, unit: 'F' })).toBeCloseTo(100, 12);
    expect(toCanonicalUnit({ quantity: 'conductivity', value: 1500, unit: 'uS/cm' })).toBeCloseTo(1.5, 12);
    expect(toCanonicalUnit({ quantity: 'flow', value: 6, unit: 'm3/h' })).toBeCloseTo(100, 12);
    expect(toCanonicalUnit({ quantity: 'water_level', value: 150, unit: 'cm' })).toBeCloseTo(1.5, 12);
    expect(() => toCanonicalUnit({ quantity: 'ph', value: 7, unit: 'F' })).toThrow(RangeError);
    expect(() => toCanonicalUnit({ quantity: 'ph', value: 7, unit: 'toString' })).toThrow(RangeError);
  });
});

describe('physical limits', () => {
  it('cover exactly the quantities of the MQTT schema', () => {
    expect(Object.keys(physicalLimits).sort()).toEqual([...quantities].sort());
    expect(Object.keys(plausibleStepPerMinute).sort()).toEqual([...quantities].sort());
  });

  it('reject impossible probe values', () => {
    // limits are product decisions (common practice, no source); pH scale 0–14
    expect(isPhysicallyPossible({ quantity: 'ph', value: 7.9 })).toBe(true);
    expect(isPhysicallyPossible({ quantity: 'ph', value: 14.2 })).toBe(false);
    expect(isPhysicallyPossible({ quantity: 'water_temperature', value: 55 })).toBe(false);
    expect(isPhysicallyPossible({ quantity: 'salinity', value: 60 })).toBe(true);
    expect(isPhysicallyPossible({ quantity: 'dissolved_oxygen', value: -0.1 })).toBe(false);
    expect(isPhysicallyPossible({ quantity: 'flow', value: 1e6 })).toBe(false);
    expect(isPhysicallyPossible({ quantity: 'pump_running', value: 0.5 })).toBe(false);
    expect(isPhysicallyPossible({ quantity: 'aerator_running', value: 1 })).toBe(true);
    expect(isPhysicallyPossible({ quantity: 'conductivity', value: Number.NaN })).toBe(false);
  });

  it('flag a pH jump of 2 units within a minute as implausible', () => {
    // plausible step limits (common practice, no source)
    expect(isPlausibleStep({ quantity: 'ph', previousValue: 7.0, value: 9.0, elapsedMinutes: 1 })).toBe(false);
    expect(isPlausibleStep({ quantity: 'ph', previousValue: 7.0, value: 9.0, elapsedMinutes: 0.2 })).toBe(false);
    expect(isPlausibleStep({ quantity: 'ph', previousValue: 7.0, value: 7.3, elapsedMinutes: 1 })).toBe(true);
    expect(isPlausibleStep({ quantity: 'ph', previousValue: 7.0, value: 9.0, elapsedMinutes: 60 })).toBe(true);
    expect(isPlausibleStep({ quantity: 'pump_running', previousValue: 0, value: 1, elapsedMinutes: 0 })).toBe(true);
  });
});
