// US EPA (2013) Aquatic Life Ambient Water Quality Criteria for Ammonia — Freshwater, EPA 822-R-13-001.
// Equations from memory (water-chemistry.md §3); they reproduce the published headline values.
// These are ambient criteria for natural waters, shown as a reference line, not culture limits.
import { checkRange } from './errors';

export type Epa2013Criteria = {
  /** Criterion maximum concentration (1-hour average), mg TAN/L, unrounded. */
  cmcMgL: number;
  /** Criterion continuous concentration (30-day rolling average), mg TAN/L, unrounded. */
  cccMgL: number;
  /** Highest 4-day average allowed within the 30 days: 2.5 × CCC, mg TAN/L, unrounded. */
  fourDayMaxMgL: number;
};

// The EPA 2013 tables span pH 6.5–9.0 and 0–30 °C; the criteria are not defined outside them.
export const EPA2013_RANGE = { pH: { min: 6.5, max: 9.0 }, temperatureC: { min: 0, max: 30 } } as const;

/** US EPA 2013 freshwater ammonia criteria (EPA 822-R-13-001), mg TAN/L, unrounded (tables print 2 significant figures). */
export function epa2013Criteria({
  pH,
  temperatureC,
  oncorhynchusPresent,
}: {
  pH: number;
  temperatureC: number;
  oncorhynchusPresent: boolean;
}): Epa2013Criteria {
  checkRange({ field: 'pH', value: pH, ...EPA2013_RANGE.pH, reason: 'range of the EPA 2013 criteria tables' });
  checkRange({
    field: 'temperatureC',
    value: temperatureC,
    ...EPA2013_RANGE.temperatureC,
    reason: 'range of the EPA 2013 criteria tables',
  });
  if (typeof oncorhynchusPresent !== 'boolean') throw new TypeError('oncorhynchusPresent must be true or false');

  const acuteBracket = 0.0114 / (1 + 10 ** (7.204 - pH)) + 1.6181 / (1 + 10 ** (pH - 7.204));
  const acuteTemperature = 23.12 * 10 ** (0.036 * (20 - temperatureC));
  const cmcMgL = oncorhynchusPresent
    ? Math.min(
        0.275 / (1 + 10 ** (7.204 - pH)) + 39.0 / (1 + 10 ** (pH - 7.204)),
        0.7249 * acuteBracket * acuteTemperature,
      )
    : 0.7249 * acuteBracket * Math.min(51.93, acuteTemperature);

  const chronicBracket = 0.0278 / (1 + 10 ** (7.688 - pH)) + 1.1994 / (1 + 10 ** (pH - 7.688));
  const cccMgL = 0.8876 * chronicBracket * 2.126 * 10 ** (0.028 * (20 - Math.max(temperatureC, 7)));

  return { cmcMgL, cccMgL, fourDayMaxMgL: 2.5 * cccMgL };
}
