// Chemistry the simulator needs on top of shared/chemistry: the inverse of PSS-78 (salinity →
// conductance, so probes can report conductance that ingest converts back) and a freshwater
// carbonate system for pH from a CO2 balance.
import { oxygenSaturationMgL, salinityFromConductivity, salinityFromSpecificConductance } from '../../shared/chemistry';

const clamp = (value: number, min: number, max: number): number => Math.min(max, Math.max(min, value));

/** DO saturation, mg/L at 1 atm (Benson & Krause 1984 via shared/chemistry), inputs clamped to the method's range. */
export function doSaturationMgL(temperatureC: number, salinityPpt: number): number {
  return oxygenSaturationMgL({ temperatureC: clamp(temperatureC, 0, 40), salinityPpt: clamp(salinityPpt, 0, 45) });
}

// Bisection on a function that increases with x; 60 halvings reach double precision on [0, 100].
function invertIncreasing(f: (x: number) => number, target: number, lo: number, hi: number): number {
  let a = lo;
  let b = hi;
  for (let i = 0; i < 60; i += 1) {
    const mid = (a + b) / 2;
    if (f(mid) < target) a = mid;
    else b = mid;
  }
  return (a + b) / 2;
}

const MAX_MS_CM = 99.9;

/** Specific conductance (mS/cm at 25 °C) for a practical salinity: PSS-78 at 25 °C inverted by bisection. */
export function specificConductanceFromSalinity(salinityPpt: number): number {
  const s = clamp(salinityPpt, 0, 45);
  if (s === 0) return 0;
  return invertIncreasing((sc) => salinityFromSpecificConductance({ specificConductanceMsCm: sc }), s, 0, MAX_MS_CM);
}

/** In-situ conductivity (mS/cm at the water temperature) for a practical salinity: PSS-78 inverted by bisection. */
export function conductivityFromSalinity(salinityPpt: number, temperatureC: number): number {
  const s = clamp(salinityPpt, 0, 45);
  const t = clamp(temperatureC, -2, 40);
  if (s === 0) return 0;
  return invertIncreasing((c) => salinityFromConductivity({ conductivityMsCm: c, temperatureC: t }), s, 0, MAX_MS_CM);
}

// --- carbonate system -----------------------------------------------------------------------
// Equilibrium constants (mol/L, T in K): Plummer & Busenberg (1982) for K1, K2 and Henry's KH,
// Harned & Owen via Stumm & Morgan for Kw (all from memory; pK1 6.35, pK2 10.33, pKH 1.47 at 25 °C).
// Brackish water: Davies activity coefficients from the ionic strength of seawater salts, a rough
// correction that ignores ion pairing (so it understates the shift in full seawater).

export interface CarbonateConstants {
  k1: number;
  k2: number;
  kh: number;
  kw: number;
  /** Activity coefficients of singly and doubly charged ions. */
  gamma1: number;
  gamma2: number;
}

export function carbonateConstants(temperatureC: number, salinityPpt: number): CarbonateConstants {
  const T = clamp(temperatureC, 0, 40) + 273.15;
  const log10T = Math.log10(T);
  const logK1 = -356.3094 - 0.06091964 * T + 21834.37 / T + 126.8339 * log10T - 1684915 / T ** 2;
  const logK2 = -107.8871 - 0.03252849 * T + 5151.79 / T + 38.92561 * log10T - 563713.9 / T ** 2;
  const logKH = 108.3865 + 0.01985076 * T - 6919.53 / T - 40.45154 * log10T + 669365 / T ** 2;
  const logKw = -4470.99 / T + 6.0875 - 0.01706 * T;
  const s = clamp(salinityPpt, 0, 45);
  const ionicStrength = (19.9273 * s) / (1000 - 1.005109 * s);
  const sqrtI = Math.sqrt(ionicStrength);
  const davies = -0.51 * (sqrtI / (1 + sqrtI) - 0.3 * ionicStrength);
  return {
    k1: 10 ** logK1,
    k2: 10 ** logK2,
    kh: 10 ** logKH,
    kw: 10 ** logKw,
    gamma1: 10 ** davies,
    gamma2: 10 ** (4 * davies),
  };
}

export interface CarbonateSpeciation {
  /** pH as a probe reads it (activity of H+, NBS scale). */
  ph: number;
  co2MmolL: number;
  hco3MmolL: number;
  co3MmolL: number;
}

function speciate(c: CarbonateConstants, dicMmolL: number, ph: number): CarbonateSpeciation & { alkalinityMeqL: number } {
  const aH = 10 ** -ph;
  const r1 = c.k1 / (aH * c.gamma1); // [HCO3-]/[CO2]
  const r2 = (c.k2 * c.gamma1) / (aH * c.gamma2); // [CO3--]/[HCO3-]
  const co2 = dicMmolL / (1 + r1 + r1 * r2);
  const hco3 = co2 * r1;
  const co3 = hco3 * r2;
  const ohMmol = (c.kw / (aH * c.gamma1)) * 1000;
  const hMmol = (aH / c.gamma1) * 1000;
  return { ph, co2MmolL: co2, hco3MmolL: hco3, co3MmolL: co3, alkalinityMeqL: hco3 + 2 * co3 + ohMmol - hMmol };
}

/** pH and species from dissolved inorganic carbon and carbonate alkalinity, by bisection on pH (alkalinity rises with pH). */
export function carbonateFromDic(c: CarbonateConstants, dicMmolL: number, alkalinityMeqL: number): CarbonateSpeciation {
  let lo = 3;
  let hi = 12.5;
  for (let i = 0; i < 50; i += 1) {
    const mid = (lo + hi) / 2;
    if (speciate(c, dicMmolL, mid).alkalinityMeqL < alkalinityMeqL) lo = mid;
    else hi = mid;
  }
  const { alkalinityMeqL: _alk, ...species } = speciate(c, dicMmolL, (lo + hi) / 2);
  return species;
}

/** DIC (mmol/L) of water with the given alkalinity at the given pH. */
export function dicFromPh(c: CarbonateConstants, ph: number, alkalinityMeqL: number): number {
  // Alkalinity is linear in DIC at fixed pH: Alk = DIC·a + (OH − H).
  const unit = speciate(c, 1, ph);
  const zero = speciate(c, 0, ph);
  return (alkalinityMeqL - zero.alkalinityMeqL) / (unit.alkalinityMeqL - zero.alkalinityMeqL);
}

/** Free CO2 (mmol/L) in equilibrium with air at the given CO2 partial pressure (atm). */
export function co2AtAirEquilibriumMmolL(c: CarbonateConstants, pco2Atm: number): number {
  return c.kh * pco2Atm * 1000;
}
