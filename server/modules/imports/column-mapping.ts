import { localParts, zonedTime } from '../../../shared/farm-time';
import type { ImportMapping, ImportWarning, SuggestedMapping } from '../../../shared/schemas/imports.schema';
import { analytes, testBases, testMethods, type Analyte } from '../../../shared/schemas/water-tests.schema';

// From file columns to the fields of a water test: suggestions from header names, and tolerant reading
// of the cells people actually type (kit names, "NH3-N", "7:30 pm", "03/04/2025", decimal commas).

type Field = 'unitCode' | 'sampledAt' | 'sampledDate' | 'sampledTime' | 'analyte' | 'method' | 'basis' | 'value' | 'ph' | 'temperature' | 'salinity' | 'note';

/** Normalised header words per field, in order of preference (English and Spanish, as crews write them). */
const headerAliases: Record<Field, string[]> = {
  unitCode: ['unit code', 'unit', 'unit id', 'pond', 'pond id', 'pond code', 'raceway', 'tank', 'culture unit', 'site', 'location', 'station', 'estanque', 'unidad', 'tanque', 'codigo'],
  sampledAt: ['sampled at', 'sampled', 'date time', 'datetime', 'timestamp', 'time stamp', 'collected at', 'fecha y hora', 'fecha hora', 'measured at'],
  sampledDate: ['date', 'sample date', 'sampling date', 'date sampled', 'collection date', 'fecha', 'day', 'dia'],
  sampledTime: ['time', 'sample time', 'sampling time', 'time of day', 'hora', 'hour'],
  analyte: ['analyte', 'parameter', 'test', 'measurement', 'determinand', 'variable', 'what', 'parametro', 'analito', 'prueba'],
  method: ['method', 'kit', 'test kit', 'kit type', 'reagent', 'technique', 'metodo', 'reactivo'],
  basis: ['basis', 'reported as', 'expressed as', 'as', 'form', 'units', 'uom', 'unit of measure', 'unidades'],
  value: ['value', 'result', 'reading', 'concentration', 'conc', 'amount', 'level', 'valor', 'resultado', 'lectura', 'concentracion'],
  ph: ['ph', 'handheld ph', 'field ph', 'meter ph', 'ph meter'],
  temperature: ['temperature', 'temp', 'water temperature', 'water temp', 'wt', 'temperatura', 'handheld temperature'],
  salinity: ['salinity', 'sal', 'salinidad', 'handheld salinity'],
  note: ['note', 'notes', 'comment', 'comments', 'remark', 'remarks', 'observation', 'observations', 'nota', 'notas', 'observaciones', 'comentario', 'comentarios'],
};

/** Lower case, no accents, units in brackets and punctuation removed: "Temp (°F)" → "temp". */
export function normalizeHeader(h: string): string {
  return h
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/\(.*?\)|\[.*?\]/g, ' ')
    .replace(/°\s*[cf]\b/g, ' ')
    .replace(/[_\-./:#]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
}

const fahrenheitHeader = (h: string) => /°\s*f|\(\s*f\s*\)|\[\s*f\s*\]|fahrenheit|(^|[\s_-])f$|deg\s*f/i.test(h);
const ammoniaHeader = (n: string) => /^(tan|nh3|nh3 n|nh4|nh4 n|ammonia|total ammonia|amonio|amoniaco|tan n)( mg l| ppm)?$/.test(n);

/** Unique, non-blank header names: blanks become "Column N", repeats get " (2)", " (3)". */
export function uniqueHeaders(raw: string[]): { headers: string[]; warnings: ImportWarning[] } {
  const warnings: ImportWarning[] = [];
  const seen = new Map<string, number>();
  const headers = raw.map((h, i) => {
    let name = h.replace(/^\uFEFF/, '').trim();
    if (!name) {
      name = `Column ${i + 1}`;
      warnings.push({ code: 'blank_header', message: `Column ${i + 1} has no name; it is called "${name}" here.` });
    }
    const key = name.toLowerCase();
    const n = (seen.get(key) ?? 0) + 1;
    seen.set(key, n);
    if (n > 1) {
      const renamed = `${name} (${n})`;
      warnings.push({ code: 'duplicate_header', message: `The column name "${name}" appears more than once; column ${i + 1} is called "${renamed}" here.` });
      return renamed;
    }
    return name;
  });
  // A rename could collide with a real header named "x (2)": keep renaming until unique.
  const final = new Set<string>();
  return {
    headers: headers.map((h) => {
      let name = h;
      for (let k = 2; final.has(name.toLowerCase()); k++) name = `${h} (${k})`;
      final.add(name.toLowerCase());
      return name;
    }),
    warnings,
  };
}

const looksNumeric = (c: string) => /^[-+]?\d+([.,]\d+)?$/.test(c.trim());
const looksDateOrTime = (c: string) => /^\d{1,4}[-/.]\d{1,2}[-/.]\d{1,4}/.test(c.trim()) || /^\d{1,2}:\d{2}/.test(c.trim());

/** True when the first row reads as data (numbers, dates) rather than column names. */
export function looksLikeDataRow(cells: string[]): boolean {
  const filled = cells.map((c) => c.trim()).filter(Boolean);
  if (!filled.length) return false;
  if (filled.some(looksDateOrTime)) return true;
  const numeric = filled.filter(looksNumeric).length;
  if (numeric >= 2) return true;
  const known = filled.some((c) => {
    const n = normalizeHeader(c);
    return Object.values(headerAliases).some((list) => list.includes(n)) || ammoniaHeader(n);
  });
  return numeric === 1 && !known;
}

const US_ZONES = new Set(['America/New_York', 'America/Chicago', 'America/Denver', 'America/Los_Angeles', 'America/Phoenix', 'America/Anchorage', 'Pacific/Honolulu', 'America/Detroit', 'America/Boise', 'America/Indiana/Indianapolis']);

/** The mapping the server proposes from header names and the preview rows. */
export function suggestMapping(headers: string[], preview: string[][], farmTimeZone: string): { mapping: SuggestedMapping; warnings: ImportWarning[] } {
  const warnings: ImportWarning[] = [];
  const used = new Set<number>();
  const norm = headers.map(normalizeHeader);
  const sample = (i: number) => preview.map((r) => (r[i] ?? '').trim()).filter(Boolean);
  const find = (field: Field, accept: (i: number) => boolean = () => true): number | null => {
    const aliases = headerAliases[field];
    for (const exactOnly of [true, false]) {
      for (const alias of aliases) {
        for (let i = 0; i < headers.length; i++) {
          if (used.has(i) || !accept(i)) continue;
          const n = norm[i]!;
          const hit = exactOnly ? n === alias : n.startsWith(`${alias} `) || n.endsWith(` ${alias}`);
          if (hit) {
            used.add(i);
            return i;
          }
        }
      }
    }
    return null;
  };
  const name = (i: number | null) => (i === null ? null : headers[i]!);
  // A "Unit"/"Units" column whose cells read "mg/L" is the measurement unit, not the culture unit.
  const measurementUnitCells = (i: number) => sample(i).some((c) => /mg|ppm|ppt|°|\/l/i.test(c));

  const note = find('note');
  const basisCol = find('basis', (i) => norm[i] !== 'unit' || measurementUnitCells(i));
  const unitCode = find('unitCode', (i) => !measurementUnitCells(i));
  const analyteCol = find('analyte');
  const methodCol = find('method');
  const at = find('sampledAt');
  let sampledAt: SuggestedMapping['sampledAt'] = null;
  if (at !== null) sampledAt = { column: headers[at]! };
  else {
    const date = find('sampledDate');
    const time = find('sampledTime');
    if (date !== null && time !== null) sampledAt = { dateColumn: headers[date]!, timeColumn: headers[time]! };
    else if (date !== null) sampledAt = { column: headers[date]! };
    else if (time !== null) sampledAt = { column: headers[time]! };
  }

  let value = find('value');
  let analyte: SuggestedMapping['analyte'] = analyteCol !== null ? { column: headers[analyteCol]! } : null;
  let basis: SuggestedMapping['basis'] = basisCol !== null ? { column: headers[basisCol]! } : null;
  // Kit logs often have one "TAN" or "NH3-N" column instead of analyte + value.
  if (value === null) {
    const i = norm.findIndex((n, k) => !used.has(k) && ammoniaHeader(n));
    if (i >= 0) {
      used.add(i);
      value = i;
      analyte ??= { fixed: 'total_ammonia' };
      const n = norm[i]!;
      const rawHeader = headers[i]!.toLowerCase();
      if (!basis) {
        if (n.startsWith('tan') || /nh3\s*[-_]?\s*n\b|as n\b/.test(rawHeader)) basis = { fixed: 'tan-n' };
        else if (n.startsWith('nh4')) basis = { fixed: 'total-nh4' };
        else
          warnings.push({
            code: 'basis_unknown',
            message: `Choose whether "${headers[i]}" is reported as N (TAN, NH3-N) or as NH3/NH4+: the free ammonia differs by about 22 %.`,
          });
      }
    }
  }
  let method: SuggestedMapping['method'] = methodCol !== null ? { column: headers[methodCol]! } : null;
  if (!method) {
    const h = headers.join(' ').toLowerCase();
    if (h.includes('salicylate')) method = { fixed: 'salicylate' };
    else if (h.includes('nessler')) method = { fixed: 'nessler' };
  }
  const ph = find('ph');
  const temperatureCol = find('temperature');
  let handheldTemperature: SuggestedMapping['handheldTemperature'] = null;
  if (temperatureCol !== null) {
    const header = headers[temperatureCol]!;
    let unit: 'c' | 'f' = fahrenheitHeader(header) ? 'f' : 'c';
    if (unit === 'c' && !/°\s*c|\(\s*c\s*\)|celsius/i.test(header)) {
      const values = sample(temperatureCol).map(Number).filter(Number.isFinite);
      if (values.length && values.every((v) => v > 45)) {
        unit = 'f';
        warnings.push({ code: 'temperature_unit_guessed', message: `"${header}" has no unit; its values look like °F. Check the temperature unit.` });
      }
    }
    handheldTemperature = { column: header, unit };
  }
  const salinity = find('salinity');

  // Dates with slashes are ambiguous (03/04/2025): guess from values above 12, else from the farm's country.
  let dateOrder: SuggestedMapping['dateOrder'] = 'ymd';
  const dateCol = sampledAt ? ('column' in sampledAt ? sampledAt.column : sampledAt.dateColumn) : null;
  if (dateCol !== null) {
    const cells = sample(headers.indexOf(dateCol));
    const slashed = cells.map((c) => /^(\d{1,2})[/.-](\d{1,2})[/.-]\d{2,4}/.exec(c)).filter((m): m is RegExpExecArray => Boolean(m));
    if (slashed.length) {
      if (slashed.some((m) => Number(m[1]) > 12)) dateOrder = 'dmy';
      else if (slashed.some((m) => Number(m[2]) > 12)) dateOrder = 'mdy';
      else {
        dateOrder = US_ZONES.has(farmTimeZone) ? 'mdy' : 'dmy';
        warnings.push({
          code: 'date_order_ambiguous',
          message: `Dates like "${slashed[0]![0]}" could be day/month or month/day; ${dateOrder === 'mdy' ? 'month/day' : 'day/month'} is assumed. Check the date order.`,
        });
      }
    }
  }
  return {
    mapping: {
      unitCode: name(unitCode),
      sampledAt,
      dateOrder,
      timeZone: farmTimeZone,
      analyte,
      method,
      basis,
      value: name(value),
      handheldPh: name(ph),
      handheldTemperature,
      handheldSalinityPpt: name(salinity),
      note: name(note),
    },
    warnings,
  };
}

/** Columns a mapping names that the file does not have. */
export function unknownColumns(mapping: ImportMapping, headers: string[]): string[] {
  const have = new Set(headers);
  const named = [
    mapping.unitCode,
    ...('column' in mapping.sampledAt ? [mapping.sampledAt.column] : [mapping.sampledAt.dateColumn, mapping.sampledAt.timeColumn]),
    'column' in mapping.analyte ? mapping.analyte.column : null,
    'column' in mapping.method ? mapping.method.column : null,
    'column' in mapping.basis ? mapping.basis.column : null,
    mapping.value,
    mapping.handheldPh ?? null,
    mapping.handheldTemperature?.column ?? null,
    mapping.handheldSalinityPpt ?? null,
    mapping.note ?? null,
  ];
  return [...new Set(named.filter((c): c is string => c !== null && !have.has(c)))];
}

// ---- cells ----------------------------------------------------------------------------------------

const squash = (s: string) =>
  s
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[\s_\-()+⁺]/g, '');

const analyteWords: Record<string, Analyte> = {
  totalammonia: 'total_ammonia', ammonia: 'total_ammonia', tan: 'total_ammonia', nh3n: 'total_ammonia', nh3: 'total_ammonia', nh4: 'total_ammonia',
  nh4n: 'total_ammonia', nh3nh4: 'total_ammonia', ammonian: 'total_ammonia', totalammonianitrogen: 'total_ammonia', amonio: 'total_ammonia',
  amoniaco: 'total_ammonia', amoniototal: 'total_ammonia', amonia: 'total_ammonia',
  nitrite: 'nitrite', no2: 'nitrite', no2n: 'nitrite', nitrito: 'nitrite', nitritos: 'nitrite',
  nitrate: 'nitrate', no3: 'nitrate', no3n: 'nitrate', nitrato: 'nitrate', nitratos: 'nitrate',
  alkalinity: 'alkalinity', alk: 'alkalinity', totalalkalinity: 'alkalinity', alcalinidad: 'alkalinity',
  chloride: 'chloride', chlorides: 'chloride', cl: 'chloride', cloruro: 'chloride', cloruros: 'chloride',
  hardness: 'hardness', totalhardness: 'hardness', gh: 'hardness', dureza: 'hardness',
  ph: 'ph',
  temperature: 'temperature', temp: 'temperature', watertemperature: 'temperature', temperatura: 'temperature',
  dissolvedoxygen: 'dissolved_oxygen', do: 'dissolved_oxygen', oxygen: 'dissolved_oxygen', o2: 'dissolved_oxygen', oxigeno: 'dissolved_oxygen',
  oxigenodisuelto: 'dissolved_oxygen', od: 'dissolved_oxygen',
  salinity: 'salinity', sal: 'salinity', salinidad: 'salinity',
};
for (const a of analytes) analyteWords[squash(a)] = a;

const methodWords: Record<string, (typeof testMethods)[number]> = {
  salicylate: 'salicylate', salicilato: 'salicylate', salicylic: 'salicylate', nessler: 'nessler',
  colorimetric: 'colorimetric', colorimetrico: 'colorimetric', colour: 'colorimetric', color: 'colorimetric',
  titration: 'titration', titracion: 'titration', titrimetric: 'titration', titrimetrico: 'titration', dropcount: 'titration', drop: 'titration',
  strip: 'strip', strips: 'strip', teststrip: 'strip', tira: 'strip', tiras: 'strip',
  meter: 'meter', probe: 'meter', handheld: 'meter', handheldmeter: 'meter', electrode: 'meter', medidor: 'meter', sonda: 'meter',
  lab: 'lab', laboratory: 'lab', laboratorio: 'lab', other: 'other', otro: 'other',
};

export function readAnalyte(cell: string): Analyte | null {
  return analyteWords[squash(cell)] ?? null;
}
export function readMethod(cell: string): (typeof testMethods)[number] | null {
  return methodWords[squash(cell)] ?? null;
}

/** "mg/L NH3-N", "as N", "NH4+", "CaCO3", "°C", "ppt" → a basis; "N" depends on the analyte. */
export function readBasis(cell: string, analyte: Analyte | null): (typeof testBases)[number] | null {
  const raw = cell.trim();
  if ((testBases as readonly string[]).includes(raw.toLowerCase())) return raw.toLowerCase() as (typeof testBases)[number];
  let s = squash(raw).replace(/^(mg\/l|mgl|ppm)/, '').replace(/^as/, '').replace(/(mg\/l|mgl|ppm)$/, '');
  if (s === '' && /mg\s*\/?\s*l|ppm/i.test(raw)) return analyte === 'dissolved_oxygen' ? 'mg-l' : null;
  if (s === 'n' || s === 'nitrogen') {
    if (analyte === 'nitrite') return 'no2-n';
    if (analyte === 'nitrate') return 'no3-n';
    return analyte === 'total_ammonia' ? 'tan-n' : null;
  }
  s = s.replace(/\//g, '');
  const words: Record<string, (typeof testBases)[number]> = {
    tann: 'tan-n', tan: 'tan-n', nh3n: 'tan-n', nh4n: 'tan-n', nh3nh4n: 'tan-n', ammonian: 'tan-n', totalammonian: 'tan-n',
    nh3: 'total-nh3', totalnh3: 'total-nh3', nh4: 'total-nh4', totalnh4: 'total-nh4',
    no2n: 'no2-n', no2: 'no2', no3n: 'no3-n', no3: 'no3', caco3: 'caco3', cl: 'cl', chloride: 'cl',
    ph: 'ph', phunits: 'ph', c: 'c', '°c': 'c', degc: 'c', celsius: 'c', ppt: 'ppt', psu: 'ppt', '‰': 'ppt', gkg: 'ppt',
  };
  return words[s] ?? null;
}

/** A number as typed: "0.5", " 1,25 " (decimal comma unless the file is comma-delimited), "+7". */
export function readNumber(cell: string, decimalComma: boolean): number | null {
  let s = cell.trim().replace(/\s+/g, '');
  if (decimalComma && /^[-+]?\d*,\d+$/.test(s)) s = s.replace(',', '.');
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(s)) return null;
  const n = Number(s);
  return Number.isFinite(n) ? n : null;
}

type Ymd = { y: number; m: number; d: number };
type Hms = { h: number; min: number; s: number; ms: number };

function validDay({ y, m, d }: Ymd): boolean {
  if (m < 1 || m > 12 || d < 1 || y < 1900 || y > 2200) return false;
  return d <= new Date(Date.UTC(y, m, 0)).getUTCDate();
}

export function readDate(cell: string, order: ImportMapping['dateOrder']): Ymd | 'ambiguous' | null {
  const s = cell.trim();
  let m = /^(\d{4})[-/.](\d{1,2})[-/.](\d{1,2})$/.exec(s);
  if (m) {
    const ymd = { y: Number(m[1]), m: Number(m[2]), d: Number(m[3]) };
    return validDay(ymd) ? ymd : null;
  }
  m = /^(\d{1,2})[-/.](\d{1,2})[-/.](\d{4}|\d{2})$/.exec(s);
  if (m) {
    if (order === 'ymd') return 'ambiguous';
    const y = m[3]!.length === 2 ? 2000 + Number(m[3]) : Number(m[3]);
    const [a, b] = [Number(m[1]), Number(m[2])];
    const ymd = order === 'dmy' ? { y, m: b, d: a } : { y, m: a, d: b };
    return validDay(ymd) ? ymd : null;
  }
  return null;
}

export function readTime(cell: string): Hms | null {
  const m = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,3}))?)?\s*([ap])?\.?\s*(m\.?)?$/i.exec(cell.trim());
  if (!m) return null;
  let h = Number(m[1]);
  const min = Number(m[2]);
  const s = m[3] ? Number(m[3]) : 0;
  const ms = m[4] ? Number(m[4].padEnd(3, '0')) : 0;
  const half = m[5]?.toLowerCase();
  if (half) {
    if (h < 1 || h > 12) return null;
    if (half === 'a' && h === 12) h = 0;
    if (half === 'p' && h !== 12) h += 12;
  }
  if (h > 23 || min > 59 || s > 59) return null;
  return { h, min, s, ms };
}

const pad = (n: number, w = 2) => String(n).padStart(w, '0');
const OFFSET_TIME = /^(\d{4}-\d{2}-\d{2})[T ](\d{2}:\d{2}(?::\d{2}(?:\.\d{1,9})?)?)\s*(Z|[+-]\d{2}:?\d{2})$/i;

/** The instant the wall clock shows this time; null when the clock skips it (the spring-forward hour). */
function localInstant(day: Ymd, t: Hms, timeZone: string): string | null {
  const dayText = `${day.y}-${pad(day.m)}-${pad(day.d)}`;
  const at = zonedTime(dayText, t.h, t.min, timeZone);
  const shown = localParts(at, timeZone);
  if (shown.day !== dayText || shown.hour !== t.h || shown.minute !== t.min) return null;
  return new Date(at.getTime() + t.s * 1000 + t.ms).toISOString();
}

/** A sample time from one cell (ISO with offset, or a local date and time) or from a date and a time cell. */
export function readSampledAt(
  cells: { at?: string; date?: string; time?: string },
  order: ImportMapping['dateOrder'],
  timeZone: string,
): { iso: string } | { problem: string } {
  if (cells.at !== undefined) {
    const s = cells.at.trim();
    if (!s) return { problem: 'is empty' };
    const withOffset = OFFSET_TIME.exec(s);
    if (withOffset) {
      const offset = withOffset[3]!.toUpperCase() === 'Z' ? 'Z' : withOffset[3]!.replace(/^([+-]\d{2})(\d{2})$/, '$1:$2');
      const ms = Date.parse(`${withOffset[1]}T${withOffset[2]}${offset}`);
      return Number.isNaN(ms) ? { problem: `"${s}" is not a date and time` } : { iso: new Date(ms).toISOString() };
    }
    const split = /^(\S+)(?:T|\s+)(.+)$/.exec(s);
    if (!split) return readDate(s, order) ? { problem: `"${s}" has a date but no time of day` } : { problem: `"${s}" is not a date and time` };
    return combine(split[1]!, split[2]!, order, timeZone);
  }
  const date = (cells.date ?? '').trim();
  const time = (cells.time ?? '').trim();
  if (!date) return { problem: 'the date is empty' };
  if (!time) return { problem: 'the time is empty' };
  return combine(date, time, order, timeZone);
}

function combine(date: string, time: string, order: ImportMapping['dateOrder'], timeZone: string): { iso: string } | { problem: string } {
  const day = readDate(date, order);
  if (day === 'ambiguous') return { problem: `"${date}" needs a date order (day/month or month/day) in the mapping` };
  if (!day) return { problem: `"${date}" is not a date` };
  const t = readTime(time);
  if (!t) return { problem: `"${time}" is not a time of day` };
  const iso = localInstant(day, t, timeZone);
  return iso ? { iso } : { problem: `${date} ${time} does not exist in ${timeZone} (the clocks moved forward that night)` };
}

export function fahrenheitToCelsius(f: number): number {
  return Math.round(((f - 32) * 5) / 9 * 100) / 100;
}

export function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}
