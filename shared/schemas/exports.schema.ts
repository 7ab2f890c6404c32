import { z } from 'zod';

// CSV downloads. Every file starts with a header row of these column names; numbers carry their unit in
// the column name. Text cells that a spreadsheet would run as a formula (= + - @, tab, CR at the start)
// are prefixed with a single quote; numeric cells are written as plain numbers (docs/imports.md).

const isoTime = z.iso.datetime({ offset: true });
const DAY_MS = 86_400_000;

export const EXPORT_MAX_RANGE_DAYS = 366;
export const EXPORT_DEFAULT_RANGE_DAYS = 7;

export const exportQuerySchema = z
  .object({
    /** Only this unit; absent = every unit of the farm. */
    unitId: z.uuid().optional(),
    /** Start of the range (inclusive); default 7 days before `to`. */
    from: isoTime.optional(),
    /** End of the range (exclusive); default now. */
    to: isoTime.optional(),
  })
  .transform((q, ctx) => {
    const to = q.to ? new Date(q.to) : new Date();
    const from = q.from ? new Date(q.from) : new Date(to.getTime() - EXPORT_DEFAULT_RANGE_DAYS * DAY_MS);
    if (from.getTime() >= to.getTime()) {
      ctx.addIssue({ code: 'custom', message: '`from` must be before `to`', path: ['from'] });
      return z.NEVER;
    }
    if (to.getTime() - from.getTime() > EXPORT_MAX_RANGE_DAYS * DAY_MS) {
      ctx.addIssue({ code: 'custom', message: `the range may span at most ${EXPORT_MAX_RANGE_DAYS} days`, path: ['from'] });
      return z.NEVER;
    }
    return { unitId: q.unitId ?? null, from, to };
  });
export type ExportQuery = z.output<typeof exportQuerySchema>;

/** One row per probe sample (probe × time), one column per quantity in its stored (canonical) unit. */
export const readingsCsvColumns = [
  'time_utc',
  'time_local',
  'unit_code',
  'probe_label',
  'probe_key',
  'ph',
  'water_temperature_c',
  'salinity_ppt',
  'conductivity_ms_cm',
  'specific_conductance_ms_cm',
  'dissolved_oxygen_mg_l',
  'flow_l_min',
  'water_level_m',
  'aerator_running',
  'pump_running',
  /** Quantities of the sample that ingest marked suspect or bad, e.g. "ph:suspect". */
  'flags',
] as const;

/** One row per kit or meter result. `value` is in `value_unit` (it differs by analyte). */
export const testsCsvColumns = [
  'time_utc',
  'time_local',
  'unit_code',
  'analyte',
  'method',
  'basis',
  'value',
  'value_unit',
  'handheld_ph',
  'handheld_temperature_c',
  'handheld_salinity_ppt',
  'aerator_on',
  'note',
  'source',
  'entered_by',
  'version',
  'test_id',
] as const;

/** One row per computed free-ammonia result, with the values used and where each came from. */
export const resultsCsvColumns = [
  'time_utc',
  'time_local',
  'unit_code',
  'status',
  'tan_mg_l',
  'nh3_n_mg_l',
  'nh3_mg_l',
  'nh3_fraction',
  'ph',
  'ph_source',
  'temperature_c',
  'temperature_source',
  'salinity_ppt',
  'salinity_source',
  'method',
  'ph_scale',
  'kit_method',
  'kit_value',
  'kit_basis',
  'flags',
  'forecast_peak_nh3_mg_l',
  'forecast_peak_time_local',
  'computed_at_utc',
  'test_id',
] as const;

export const exportKinds = ['readings', 'tests', 'results'] as const;
export type ExportKind = (typeof exportKinds)[number];
