import { readingsCsvColumns, resultsCsvColumns, testsCsvColumns } from '../../../shared/schemas/exports.schema';
import type { Cell } from './csv-writer';
import type { ReadingSampleRow, ResultExportRow, TestExportRow } from './exports.repository';

// Every column of every download, in order; the header names come from shared/schemas/exports.schema.

/** The header row; the farm-local time column names its time zone. */
export function csvHeader(columns: readonly string[], timeZone: string): string[] {
  return columns.map((c) => (c === 'time_local' ? `time_local (${timeZone})` : c));
}

export function readingCells(r: ReadingSampleRow, unitCode: string | null, probeLabel: string, probeKey: string): Cell[] {
  const row: Record<(typeof readingsCsvColumns)[number], Cell> = {
    time_utc: r.time_utc,
    time_local: r.time_local,
    unit_code: unitCode,
    probe_label: probeLabel,
    probe_key: probeKey,
    ph: r.ph,
    water_temperature_c: r.water_temperature,
    salinity_ppt: r.salinity,
    conductivity_ms_cm: r.conductivity,
    specific_conductance_ms_cm: r.specific_conductance,
    dissolved_oxygen_mg_l: r.dissolved_oxygen,
    flow_l_min: r.flow,
    water_level_m: r.water_level,
    aerator_running: r.aerator_running,
    pump_running: r.pump_running,
    flags: r.flags,
  };
  return readingsCsvColumns.map((c) => row[c]);
}

export function testCells(t: TestExportRow): Cell[] {
  const row: Record<(typeof testsCsvColumns)[number], Cell> = {
    time_utc: t.time_utc,
    time_local: t.time_local,
    unit_code: t.unit_code,
    analyte: t.analyte,
    method: t.method,
    basis: t.basis,
    value: t.value,
    value_unit: t.unit,
    handheld_ph: t.handheld_ph,
    handheld_temperature_c: t.handheld_temperature_c,
    handheld_salinity_ppt: t.handheld_salinity_ppt,
    aerator_on: t.aerator_on,
    note: t.note,
    source: t.source,
    entered_by: t.entered_by,
    version: t.version,
    test_id: t.id,
  };
  return testsCsvColumns.map((c) => row[c]);
}

function sourceOf(r: ResultExportRow, quantity: string): string | null {
  const v = r.provenance?.values?.find((x) => x.quantity === quantity);
  if (!v?.source) return null;
  return v.probeLabel ? `${v.source} (${v.probeLabel})` : v.source;
}

export function resultCells(r: ResultExportRow): Cell[] {
  const row: Record<(typeof resultsCsvColumns)[number], Cell> = {
    time_utc: r.time_utc,
    time_local: r.time_local,
    unit_code: r.unit_code,
    status: r.status,
    tan_mg_l: r.tan_mg_l,
    nh3_n_mg_l: r.nh3_n_mg_l,
    nh3_mg_l: r.nh3_mg_l,
    nh3_fraction: r.fraction,
    ph: r.ph,
    ph_source: sourceOf(r, 'ph'),
    temperature_c: r.temperature_c,
    temperature_source: sourceOf(r, 'water_temperature'),
    salinity_ppt: r.salinity_ppt,
    salinity_source: sourceOf(r, 'salinity'),
    method: r.method,
    ph_scale: r.ph_scale,
    kit_method: r.kit_method,
    kit_value: r.kit_value,
    kit_basis: r.kit_basis,
    flags: (r.flags ?? []).map((f) => f.code).join(' ') || null,
    forecast_peak_nh3_mg_l: r.forecast_peak?.nh3MgL ?? null,
    forecast_peak_time_local: r.forecast_peak?.localTime ?? null,
    computed_at_utc: r.computed_at_utc,
    test_id: r.water_test_id,
  };
  return resultsCsvColumns.map((c) => row[c]);
}
