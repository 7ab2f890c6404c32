import { analyteRules } from '@shared/schemas/water-tests.schema';
import type { TFunction } from 'i18next';
import type { FieldError } from 'react-hook-form';
import { formatNumber, temperatureSymbol, toDisplayTemperature, type TemperatureUnit } from './format';
import type { TestFormField, TestFormValues } from './test-form';

/** Handheld ranges of createWaterTestSchema (the schema refuses values outside them). */
const HANDHELD = { ph: { min: 0, max: 14 }, temperatureC: { min: -5, max: 50 }, salinityPpt: { min: 0, max: 45 } } as const;

/**
 * The words beside a field for a problem the shared schema found (the issue code is the error type);
 * the limits come from the same rules the schema applies.
 */
export function testErrorText(
  t: TFunction,
  field: TestFormField,
  error: FieldError | undefined,
  values: TestFormValues,
  temperatureUnit: TemperatureUnit,
  lang: string,
): string | undefined {
  if (!error) return undefined;
  if (error.type === 'server') return error.message;
  const n = (v: number) => formatNumber(v, lang, 2);
  const temp = (c: number) => `${formatNumber(toDisplayTemperature(c, temperatureUnit), lang, 0)} ${temperatureSymbol(temperatureUnit)}`;
  const notNumber = error.type === 'invalid_type';
  switch (field) {
    case 'unitId':
      return t('pondside.errors.unit');
    case 'reading': {
      if (notNumber) return values.reading.trim() ? t('pondside.errors.notNumber') : t('pondside.errors.readingRequired');
      const rule = analyteRules[values.analyte];
      if (values.analyte === 'temperature') return t('pondside.errors.between', { min: temp(rule.min), max: temp(rule.max) });
      return t('pondside.errors.between', { min: `${n(rule.min)} ${rule.unit}`, max: `${n(rule.max)} ${rule.unit}` });
    }
    case 'ph':
      return notNumber
        ? t('pondside.errors.notNumber')
        : t('pondside.errors.between', { min: n(HANDHELD.ph.min), max: n(HANDHELD.ph.max) });
    case 'temperature':
      return notNumber
        ? t('pondside.errors.notNumber')
        : t('pondside.errors.between', { min: temp(HANDHELD.temperatureC.min), max: temp(HANDHELD.temperatureC.max) });
    case 'salinity':
      return notNumber
        ? t('pondside.errors.notNumber')
        : t('pondside.errors.between', { min: `${n(HANDHELD.salinityPpt.min)} ‰`, max: `${n(HANDHELD.salinityPpt.max)} ‰` });
    case 'sampledTime':
      return t('pondside.errors.future');
    case 'note':
      return t('errors.tooLong');
    case 'method':
    case 'basis':
    case 'analyte':
      return t('pondside.errors.choose');
    default:
      return error.message || t('errors.invalid');
  }
}
