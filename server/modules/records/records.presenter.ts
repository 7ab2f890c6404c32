import { localParts } from '../../../shared/farm-time';
import { recordsCsvColumns, valueSources, type RecordSection, type RecordsResponse, type RecordTest } from '../../../shared/schemas/records.schema';
import type { Cell } from '../exports/csv-writer';
import type { RecordUnit, TestRecordRow } from './records.repository';
import type { RecordsBook } from './records.service';

type Source = (typeof valueSources)[number];
type Used = { value: number; source: Source; probeLabel: string | null };

/** Wall-clock time in the farm's zone, to the minute: "2025-03-04 07:30". */
export function localStamp(at: Date, timeZone: string): string {
  const p = localParts(at, timeZone);
  return `${p.day} ${String(p.hour).padStart(2, '0')}:${String(p.minute).padStart(2, '0')}`;
}

function used(t: TestRecordRow, quantity: string): Used | null {
  const v = t.r_provenance?.values?.find((x) => x.quantity === quantity);
  if (!v || typeof v.value !== 'number' || !(valueSources as readonly string[]).includes(v.source ?? '')) return null;
  return { value: v.value, source: v.source as Source, probeLabel: v.probeLabel ?? null };
}

/** The result belongs to the test only when computed from its current version. */
const current = (t: TestRecordRow) => t.r_status !== null && t.r_test_version === t.version;

function presentTest(t: TestRecordRow, timeZone: string): RecordTest {
  return {
    testId: t.id,
    sampledAt: t.sampled_at.toISOString(),
    sampledAtLocal: localStamp(t.sampled_at, timeZone),
    analyte: t.analyte,
    method: t.method,
    basis: t.basis,
    value: t.value,
    unit: t.unit,
    handheldPh: t.handheld_ph,
    handheldTemperatureC: t.handheld_temperature_c,
    handheldSalinityPpt: t.handheld_salinity_ppt,
    note: t.note,
    source: t.source,
    enteredBy: t.entered_by,
    version: t.version,
    freeAmmonia: current(t)
      ? {
          status: t.r_status!,
          tanMgL: t.r_tan_mg_l,
          nh3NMgL: t.r_nh3_n_mg_l,
          nh3MgL: t.r_nh3_mg_l,
          method: t.r_method,
          ph: used(t, 'ph'),
          temperatureC: used(t, 'water_temperature'),
          salinityPpt: used(t, 'salinity'),
          flags: t.r_flags ?? [],
          computedAt: (t.r_computed_at ?? t.sampled_at).toISOString(),
        }
      : null,
  };
}

const zeroSources = (): Record<Source, number> => ({ probe: 0, probe_interpolated: 0, handheld: 0, unit_default: 0 });

export function presentRecords(b: RecordsBook): RecordsResponse {
  const tz = b.farm.timeZone;
  const unitRef = new Map(b.units.map((u) => [u.id, { id: u.id, code: u.code, name: u.name, kind: u.kind }]));
  const ref = (id: string) => unitRef.get(id) ?? { id, code: '?', name: '?', kind: '?' };
  const byUnit = new Map<string, TestRecordRow[]>();
  for (const t of b.tests) byUnit.set(t.unit_id, [...(byUnit.get(t.unit_id) ?? []), t]);
  const waterQuality = b.units.map((u: RecordUnit) => {
    const tests = byUnit.get(u.id) ?? [];
    const provenance = { computed: 0, notComputed: 0, ph: zeroSources(), temperature: zeroSources(), salinity: zeroSources() };
    let maxNh3MgL: number | null = null;
    for (const t of tests) {
      if (t.analyte !== 'total_ammonia') continue;
      if (current(t) && t.r_status === 'ok') {
        provenance.computed++;
        if (t.r_nh3_mg_l !== null) maxNh3MgL = Math.max(maxNh3MgL ?? 0, t.r_nh3_mg_l);
        const ph = used(t, 'ph');
        const temperature = used(t, 'water_temperature');
        const salinity = used(t, 'salinity');
        if (ph) provenance.ph[ph.source]++;
        if (temperature) provenance.temperature[temperature.source]++;
        if (salinity) provenance.salinity[salinity.source]++;
      } else provenance.notComputed++;
    }
    return { unit: ref(u.id), tests: tests.map((t) => presentTest(t, tz)), maxNh3MgL, provenance };
  });
  return {
    farm: { id: b.farm.id, name: b.farm.name, timeZone: tz },
    period: { from: b.period.from.toISOString(), to: b.period.to.toISOString(), fromLocal: b.period.fromDay, toLocal: b.period.toDay },
    generatedAt: b.generatedAt.toISOString(),
    waterQuality,
    treatments: b.treatments.map((t) => ({
      id: t.id,
      unit: ref(t.unit_id),
      product: t.product,
      productName: t.product_name,
      dose: t.dose,
      doseUnit: t.dose_unit,
      startsAt: t.starts_at.toISOString(),
      startsAtLocal: localStamp(t.starts_at, tz),
      endsAt: t.ends_at?.toISOString() ?? null,
      withdrawalDays: t.withdrawal_days,
      withdrawalDegreeDays: t.withdrawal_degree_days,
      withdrawalEndsAt: t.withdrawal_ends_at?.toISOString() ?? null,
      withdrawalEndsAtLocal: t.withdrawal_ends_at ? localStamp(t.withdrawal_ends_at, tz) : null,
      note: t.note,
      recordedBy: t.recorded_by,
    })),
    mortalities: b.mortalities.map((m) => ({
      id: m.id,
      unit: ref(m.unit_id),
      at: m.at.toISOString(),
      atLocal: localStamp(m.at, tz),
      count: m.count,
      totalWeightKg: m.total_weight_kg,
      note: m.note,
      recordedBy: m.recorded_by,
    })),
    feeding: b.feeding.map((f) => ({
      id: f.id,
      unit: ref(f.unit_id),
      day: f.day,
      fedKg: f.fed_kg,
      withheld: f.withheld,
      reason: f.reason,
      response: f.response,
      fedAt: f.fed_at.toISOString(),
      fedAtLocal: localStamp(f.fed_at, tz),
      recordedBy: f.recorded_by,
    })),
    totals: {
      tests: b.tests.length,
      treatments: b.treatments.length,
      mortalityCount: b.mortalities.reduce((n, m) => n + (m.count ?? 0), 0),
      fedKg: Math.round(b.feeding.reduce((n, f) => n + (f.withheld ? 0 : f.fed_kg), 0) * 1000) / 1000,
      withheldRecords: b.feeding.filter((f) => f.withheld).length,
    },
  };
}

const sourceText = (u: Used | null) => (u ? (u.probeLabel ? `${u.source} (${u.probeLabel})` : u.source) : null);

/** The rows of one section of the records as CSV cells, in the order of recordsCsvColumns. */
export function recordsCsvRows(b: RecordsBook, section: RecordSection): Cell[][] {
  const tz = b.farm.timeZone;
  const code = new Map(b.units.map((u) => [u.id, u]));
  const unitCode = (id: string) => code.get(id)?.code ?? null;
  const pick = <S extends RecordSection>(s: S, row: Record<(typeof recordsCsvColumns)[S][number], Cell>): Cell[] =>
    recordsCsvColumns[s].map((c: (typeof recordsCsvColumns)[S][number]) => row[c]);
  switch (section) {
    case 'water_quality':
      return [...b.tests]
        .sort((x, y) => (unitCode(x.unit_id) ?? '').localeCompare(unitCode(y.unit_id) ?? '') || x.sampled_at.getTime() - y.sampled_at.getTime())
        .map((t) => {
          const ok = current(t);
          const ph = ok ? used(t, 'ph') : null;
          const temperature = ok ? used(t, 'water_temperature') : null;
          const salinity = ok ? used(t, 'salinity') : null;
          return pick('water_quality', {
            unit_code: unitCode(t.unit_id),
            unit_name: code.get(t.unit_id)?.name ?? null,
            time_utc: t.sampled_at.toISOString(),
            time_local: localStamp(t.sampled_at, tz),
            analyte: t.analyte,
            method: t.method,
            basis: t.basis,
            value: t.value,
            value_unit: t.unit,
            handheld_ph: t.handheld_ph,
            handheld_temperature_c: t.handheld_temperature_c,
            handheld_salinity_ppt: t.handheld_salinity_ppt,
            nh3_status: ok ? t.r_status : null,
            tan_mg_l: ok ? t.r_tan_mg_l : null,
            nh3_n_mg_l: ok ? t.r_nh3_n_mg_l : null,
            nh3_mg_l: ok ? t.r_nh3_mg_l : null,
            ph_used: ph?.value ?? null,
            ph_source: sourceText(ph),
            temperature_c_used: temperature?.value ?? null,
            temperature_source: sourceText(temperature),
            salinity_ppt_used: salinity?.value ?? null,
            salinity_source: sourceText(salinity),
            flags: ok ? (t.r_flags ?? []).map((f) => f.code).join(' ') || null : null,
            note: t.note,
            source: t.source,
            entered_by: t.entered_by,
            version: t.version,
            test_id: t.id,
          });
        });
    case 'treatments':
      return b.treatments.map((t) =>
        pick('treatments', {
          unit_code: unitCode(t.unit_id),
          product: t.product,
          product_name: t.product_name,
          dose: t.dose,
          dose_unit: t.dose_unit,
          starts_utc: t.starts_at.toISOString(),
          starts_local: localStamp(t.starts_at, tz),
          ends_utc: t.ends_at?.toISOString() ?? null,
          withdrawal_days: t.withdrawal_days,
          withdrawal_degree_days: t.withdrawal_degree_days,
          withdrawal_ends_utc: t.withdrawal_ends_at?.toISOString() ?? null,
          withdrawal_ends_local: t.withdrawal_ends_at ? localStamp(t.withdrawal_ends_at, tz) : null,
          note: t.note,
          recorded_by: t.recorded_by,
          treatment_id: t.id,
        }),
      );
    case 'mortalities':
      return b.mortalities.map((m) =>
        pick('mortalities', {
          unit_code: unitCode(m.unit_id),
          time_utc: m.at.toISOString(),
          time_local: localStamp(m.at, tz),
          count: m.count,
          total_weight_kg: m.total_weight_kg,
          note: m.note,
          recorded_by: m.recorded_by,
          event_id: m.id,
        }),
      );
    case 'feeding':
      return b.feeding.map((f) =>
        pick('feeding', {
          unit_code: unitCode(f.unit_id),
          day: f.day,
          fed_kg: f.fed_kg,
          withheld: f.withheld,
          reason: f.reason,
          response: f.response,
          fed_at_utc: f.fed_at.toISOString(),
          fed_at_local: localStamp(f.fed_at, tz),
          recorded_by: f.recorded_by,
          record_id: f.id,
        }),
      );
  }
}
