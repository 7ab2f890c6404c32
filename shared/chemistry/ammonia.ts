// Un-ionized ("free") ammonia from total ammonia nitrogen, pH, temperature and salinity.
// Methods and check values: water-chemistry.md §1–2, docs/science.md.
import { NH3_PER_NH3_N, NH4_PER_NH4_N, chemistryLimits } from '../units';
import { ChemistryInputError, checkRange } from './errors';
import { type TimeInput, toEpochMs } from './time';

export const ammoniaMethods = ['emerson1975', 'khoo1977', 'cw95-total'] as const;
export type AmmoniaMethod = (typeof ammoniaMethods)[number];
/** pH scale a method's pKa is defined on: NBS (what farm probes and NBS buffers give) or total. */
export type PhScale = 'nbs' | 'total';

export type AmmoniaMethodInfo = {
  method: AmmoniaMethod;
  pHScale: PhScale;
  title: string;
  source: string;
  label: 'published' | 'from memory';
  temperatureC: { min: number; max: number };
  salinityPpt: { min: number; max: number };
};

/** What each method is, where it comes from and where Gillwise accepts it. */
export const ammoniaMethodInfo: Record<AmmoniaMethod, AmmoniaMethodInfo> = {
  emerson1975: {
    method: 'emerson1975',
    pHScale: 'nbs',
    title: 'Emerson et al. 1975, fresh water',
    source: 'Emerson, Russo, Lund & Thurston (1975), J. Fish. Res. Board Can. 32: 2379–2383',
    label: 'published',
    temperatureC: { min: 0, max: 50 },
    salinityPpt: chemistryLimits.salinityPpt,
  },
  khoo1977: {
    method: 'khoo1977',
    pHScale: 'nbs',
    title: 'Khoo et al. 1977, salinity-corrected (NBS / probe pH)',
    source: 'Khoo, Culberson & Bates (1977), J. Solution Chem. 6: 281–290',
    label: 'published',
    temperatureC: { min: 0, max: 50 },
    salinityPpt: chemistryLimits.salinityPpt,
  },
  'cw95-total': {
    method: 'cw95-total',
    pHScale: 'total',
    title: 'Clegg & Whitfield 1995 eq. 18 (total pH scale)',
    source: 'Clegg & Whitfield (1995), Geochim. Cosmochim. Acta 59: 2403–2421, eq. 18',
    label: 'published',
    temperatureC: { min: -2, max: 40 },
    salinityPpt: { min: 0, max: 40 },
  },
};

/** Salinity (‰) from which the default method switches from Emerson to Khoo. */
export const SALINE_DEFAULT_FROM_PPT = 0.5;

/** Default rule (water-chemistry.md §2): Emerson 1975 below 0.5 ‰, Khoo 1977 from 0.5 ‰. */
export function defaultAmmoniaMethod({ salinityPpt }: { salinityPpt: number }): AmmoniaMethod {
  return salinityPpt < SALINE_DEFAULT_FROM_PPT ? 'emerson1975' : 'khoo1977';
}

const KELVIN = 273.15;

// Emerson et al. 1975: pKa of NH4+ at zero ionic strength, T in kelvin.
function pKaEmerson(temperatureC: number): number {
  return 0.09018 + 2729.92 / (temperatureC + KELVIN);
}

/** Ionic strength (mol/kg) from salinity, the form used with the Khoo approach (from memory). */
export function ionicStrengthFromSalinity({ salinityPpt }: { salinityPpt: number }): number {
  checkRange({ field: 'salinityPpt', value: salinityPpt, ...chemistryLimits.salinityPpt });
  return (19.9273 * salinityPpt) / (1000 - 1.005109 * salinityPpt);
}

// Khoo, Culberson & Bates 1977: Emerson pKa plus (0.1552 − 0.0003142·t)·I, with t in °C (not kelvin).
function pKaKhoo(temperatureC: number, salinityPpt: number): number {
  const ionicStrength = ionicStrengthFromSalinity({ salinityPpt });
  return pKaEmerson(temperatureC) + (0.1552 - 0.0003142 * temperatureC) * ionicStrength;
}

// Clegg & Whitfield 1995 eq. 18: pKa on the total pH scale, T in kelvin, S 0–40.
function pKaCleggWhitfield(temperatureC: number, salinityPpt: number): number {
  const T = temperatureC + KELVIN;
  const S = salinityPpt;
  const sqrtT = Math.sqrt(T);
  return (
    9.244605 -
    2729.33 * (1 / 298.15 - 1 / T) +
    (0.04203362 - 11.24742 / T) * S ** 0.25 +
    (-13.6416 + 1.176949 * sqrtT - 0.02860785 * T + 545.4834 / T) * S ** 0.5 +
    (-0.1462507 + 0.0090226468 * sqrtT - 0.0001471361 * T + 10.5425 / T) * S ** 1.5 +
    (0.004669309 - 0.0001691742 * sqrtT - 0.5677934 / T) * S ** 2 +
    (-2.354039e-5 + 0.009698623 / T) * S ** 2.5
  );
}

export type UnionizedFractionResult = {
  /** Fraction of TAN present as NH3, strictly between 0 and 1. */
  fraction: number;
  /** pKa of NH4+ used, on the method's pH scale. */
  pKa: number;
  method: AmmoniaMethod;
  /** pH scale the pH must be on for this method: 'nbs' for emerson1975/khoo1977, 'total' for cw95-total. */
  pHScale: PhScale;
};

/** Fraction of TAN present as un-ionized NH3: f = 1 / (1 + 10^(pKa − pH)), pKa by the chosen published method. */
export function unionizedFraction({
  pH,
  temperatureC,
  salinityPpt = 0,
  method,
}: {
  pH: number;
  temperatureC: number;
  salinityPpt?: number;
  method?: AmmoniaMethod;
}): UnionizedFractionResult {
  checkRange({ field: 'salinityPpt', value: salinityPpt, ...chemistryLimits.salinityPpt });
  const chosen = method ?? defaultAmmoniaMethod({ salinityPpt });
  const info = Object.hasOwn(ammoniaMethodInfo, chosen) ? ammoniaMethodInfo[chosen] : undefined;
  if (!info)
    throw new RangeError(`unknown ammonia method ${JSON.stringify(chosen)}; use one of ${ammoniaMethods.join(', ')}`);
  checkRange({ field: 'pH', value: pH, ...chemistryLimits.pH });
  checkRange({ field: 'temperatureC', value: temperatureC, ...info.temperatureC, reason: `valid range of ${chosen}` });
  checkRange({ field: 'salinityPpt', value: salinityPpt, ...info.salinityPpt, reason: `valid range of ${chosen}` });

  const pKa =
    chosen === 'emerson1975'
      ? pKaEmerson(temperatureC)
      : chosen === 'khoo1977'
        ? pKaKhoo(temperatureC, salinityPpt)
        : pKaCleggWhitfield(temperatureC, salinityPpt);
  const fraction = 1 / (1 + 10 ** (pKa - pH));
  return { fraction, pKa, method: chosen, pHScale: info.pHScale };
}

/** How a kit reports its ammonia result: as N (TAN), as total ammonia expressed as NH3, or as NH4+. */
export type AmmoniaReadingBasis = 'tan-n' | 'total-nh3' | 'total-nh4';

/** Total ammonia nitrogen (mg N/L) from a kit reading on the given basis (molar-mass ratios, computed). */
export function tanFromReadingMgL({ readingMgL, basis }: { readingMgL: number; basis: AmmoniaReadingBasis }): number {
  checkRange({ field: 'readingMgL', value: readingMgL, min: 0, max: 1e4 });
  switch (basis) {
    case 'tan-n':
      return readingMgL;
    case 'total-nh3':
      return readingMgL / NH3_PER_NH3_N;
    case 'total-nh4':
      return readingMgL / NH4_PER_NH4_N;
    default:
      throw new RangeError(`unknown ammonia reading basis ${JSON.stringify(basis)}; use tan-n, total-nh3 or total-nh4`);
  }
}

export type FreeAmmoniaResult = {
  /** Total ammonia nitrogen, mg N/L. */
  tanMgL: number;
  /** Un-ionized ammonia as nitrogen, mg N/L. */
  nh3NMgL: number;
  /** Un-ionized ammonia as NH3, mg NH3/L (= NH3-N × 1.21588). */
  nh3MgL: number;
  fraction: number;
  method: AmmoniaMethod;
  pHScale: PhScale;
};

/** Free ammonia from a kit reading: NH3-N = f × TAN, with f from unionizedFraction (Emerson / Khoo / Clegg & Whitfield). */
export function freeAmmonia({
  readingMgL,
  basis,
  pH,
  temperatureC,
  salinityPpt,
  method,
}: {
  readingMgL: number;
  basis: AmmoniaReadingBasis;
  pH: number;
  temperatureC: number;
  salinityPpt: number;
  method?: AmmoniaMethod;
}): FreeAmmoniaResult {
  const tanMgL = tanFromReadingMgL({ readingMgL, basis });
  const {
    fraction,
    method: used,
    pHScale,
  } = unionizedFraction({ pH, temperatureC, salinityPpt, ...(method ? { method } : {}) });
  const nh3NMgL = fraction * tanMgL;
  return { tanMgL, nh3NMgL, nh3MgL: nh3NMgL * NH3_PER_NH3_N, fraction, method: used, pHScale };
}

export type ForecastPoint<T extends TimeInput = TimeInput> = { at: T; pH: number; temperatureC: number };

export type PeakNh3Forecast<T extends TimeInput> = {
  nh3NMgL: number;
  nh3MgL: number;
  /** Time of the highest point, exactly as it was given in the series. */
  at: T;
  fraction: number;
  method: AmmoniaMethod;
  pHScale: PhScale;
};

/**
 * Highest free ammonia over a forecast of pH and temperature at a constant TAN (same methods as
 * unionizedFraction). The first point wins a tie. Throws on an empty series.
 */
export function forecastPeakNh3<P extends ForecastPoint>({
  tanMgL,
  series,
  salinityPpt = 0,
  method,
}: {
  tanMgL: number;
  series: readonly P[];
  salinityPpt?: number;
  method?: AmmoniaMethod;
}): PeakNh3Forecast<P['at']> {
  checkRange({ field: 'tanMgL', value: tanMgL, min: 0, max: 1e4 });
  if (series.length === 0) throw new RangeError('forecastPeakNh3 needs at least one point in series');
  let best: PeakNh3Forecast<P['at']> | undefined;
  series.forEach((point, i) => {
    toEpochMs({ field: `series[${i}].at`, at: point.at });
    let result: UnionizedFractionResult;
    try {
      result = unionizedFraction({
        pH: point.pH,
        temperatureC: point.temperatureC,
        salinityPpt,
        ...(method ? { method } : {}),
      });
    } catch (error) {
      const perPoint = error instanceof ChemistryInputError && (error.field === 'pH' || error.field === 'temperatureC');
      throw perPoint ? error.withFieldPrefix(`series[${i}].`) : error;
    }
    const nh3NMgL = result.fraction * tanMgL;
    if (!best || nh3NMgL > best.nh3NMgL) {
      best = {
        nh3NMgL,
        nh3MgL: nh3NMgL * NH3_PER_NH3_N,
        at: point.at,
        fraction: result.fraction,
        method: result.method,
        pHScale: result.pHScale,
      };
    }
  });
  if (!best) throw new RangeError('forecastPeakNh3 needs at least one point in series');
  return best;
}
