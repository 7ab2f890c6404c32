// Dissolved-oxygen saturation in water in equilibrium with water-saturated air (water-chemistry.md §5).
import { physicalLimits } from '../units';
import { checkRange } from './errors';

const KELVIN = 273.15;
// Ranges accepted here (product decision within the fits' calibration data): 0–40 °C, S 0–45 for
// Benson & Krause; Garcia & Gordon fitted −2 to 40 °C and S 0–42 (from memory).
const BK_TEMPERATURE_C = { min: 0, max: 40 } as const;
const BK_SALINITY_PPT = { min: 0, max: 45 } as const;
const GG_TEMPERATURE_C = { min: -2, max: 40 } as const;
const GG_SALINITY_PPT = { min: 0, max: 42 } as const;
// Barometric pressure in atm: about 5 500 m altitude up to a deep low-lying basin.
const PRESSURE_ATM = { min: 0.5, max: 1.1 } as const;

/** Oxygen saturation, mg/L, at 1 atm: Benson & Krause (1984) as in APHA Standard Methods 4500-O, with its pressure correction. */
export function oxygenSaturationMgL({
  temperatureC,
  salinityPpt = 0,
  pressureAtm = 1,
}: {
  temperatureC: number;
  salinityPpt?: number;
  pressureAtm?: number;
}): number {
  checkRange({
    field: 'temperatureC',
    value: temperatureC,
    ...BK_TEMPERATURE_C,
    reason: 'range of Benson & Krause 1984',
  });
  checkRange({ field: 'salinityPpt', value: salinityPpt, ...BK_SALINITY_PPT });
  checkRange({ field: 'pressureAtm', value: pressureAtm, ...PRESSURE_ATM });
  const T = temperatureC + KELVIN;
  const lnC =
    -139.34411 +
    1.575701e5 / T -
    6.642308e7 / T ** 2 +
    1.2438e10 / T ** 3 -
    8.621949e11 / T ** 4 -
    salinityPpt * (1.7674e-2 - 1.0754e1 / T + 2.1407e3 / T ** 2);
  const atOneAtm = Math.exp(lnC);
  if (pressureAtm === 1) return atOneAtm;
  // Pressure correction (APHA 4500-O; from memory): water-vapour pressure Pwv in atm and θ.
  const pwv = Math.exp(11.8571 - 3840.7 / T - 216961 / T ** 2);
  const theta = 0.000975 - 1.426e-5 * temperatureC + 6.436e-8 * temperatureC ** 2;
  return (atOneAtm * pressureAtm * (1 - pwv / pressureAtm) * (1 - theta * pressureAtm)) / ((1 - pwv) * (1 - theta));
}

const GG_A = [5.80871, 3.20291, 4.17887, 5.10006, -9.86643e-2, 3.80369] as const;
const GG_B = [-7.01577e-3, -7.70028e-3, -1.13864e-2, -9.51519e-3] as const;
const GG_C0 = -2.75915e-7;

/** Oxygen solubility, µmol/kg, at 1 atm total pressure: Garcia & Gordon (1992) fit to Benson & Krause data. */
export function oxygenSolubilityUmolKg({
  temperatureC,
  salinityPpt,
}: {
  temperatureC: number;
  salinityPpt: number;
}): number {
  checkRange({
    field: 'temperatureC',
    value: temperatureC,
    ...GG_TEMPERATURE_C,
    reason: 'range of Garcia & Gordon 1992',
  });
  checkRange({ field: 'salinityPpt', value: salinityPpt, ...GG_SALINITY_PPT, reason: 'range of Garcia & Gordon 1992' });
  const ts = Math.log((298.15 - temperatureC) / (KELVIN + temperatureC));
  const poly = (coefficients: readonly number[]): number => coefficients.reduceRight((sum, c) => sum * ts + c, 0);
  return Math.exp(poly(GG_A) + salinityPpt * poly(GG_B) + GG_C0 * salinityPpt ** 2);
}

/** DO percent saturation = measured / C_sat(t, S, P) × 100, with C_sat from Benson & Krause (APHA 4500-O). */
export function oxygenPercentSaturation({
  doMgL,
  temperatureC,
  salinityPpt,
  pressureAtm,
}: {
  doMgL: number;
  temperatureC: number;
  salinityPpt: number;
  pressureAtm: number;
}): number {
  checkRange({
    field: 'doMgL',
    value: doMgL,
    min: physicalLimits.dissolved_oxygen.min,
    max: physicalLimits.dissolved_oxygen.max,
  });
  return (doMgL / oxygenSaturationMgL({ temperatureC, salinityPpt, pressureAtm })) * 100;
}
