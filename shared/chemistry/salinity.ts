// Practical salinity from conductivity: PSS-78 (UNESCO 1983, Technical Papers in Marine Science 44),
// extended below S = 2 by Hill, Dauphinee & Woods (1986) in the form TEOS-10 uses, scaled so that
// it joins PSS-78 continuously at S = 2. Temperatures in are ITS-90; PSS-78 is written in IPTS-68.
// All three exported functions return practical salinity as a plain number (PSU, treated as ‰).
import { physicalLimits } from '../units';
import { checkRange } from './errors';

/** Conductivity of standard seawater at S 35, 15 °C (IPTS-68), 0 dbar, mS/cm (UNESCO 1983). */
export const C35_15_0_MS_CM = 42.914;

const A = [0.008, -0.1692, 25.3851, 14.0941, -7.0261, 2.7081] as const;
const B = [0.0005, -0.0056, -0.0066, -0.0375, 0.0636, -0.0144] as const;
const C = [0.6766097, 2.00564e-2, 1.104259e-4, -6.9698e-7, 1.0031e-9] as const;
const D = [3.426e-2, 4.464e-4, 4.215e-1, -3.107e-3] as const;
const E = [2.07e-5, -6.37e-10, 3.989e-15] as const;
const K = 0.0162;

// Range accepted here: PSS-78 is specified for −2 to 35 °C and 0–10 000 dbar; its own check
// value uses 40 °C, so Gillwise accepts up to 40 °C. Results above S 42 are an extrapolation.
const TEMPERATURE_RANGE_C = { min: -2, max: 40 } as const;
const PRESSURE_RANGE_DBAR = { min: 0, max: 10000 } as const;
const RATIO_RANGE = { min: 0, max: physicalLimits.conductivity.max / C35_15_0_MS_CM } as const;

const t68FromT90 = (t90: number): number => 1.00024 * t90;
const ft = (t68: number): number => (t68 - 15) / (1 + K * (t68 - 15));

// Σ a_i Rt^(i/2) + f(t)·Σ b_i Rt^(i/2), written in sqrt(Rt).
function pss78FromSqrtRt(sqrtRt: number, t68: number): number {
  let a = 0;
  let b = 0;
  for (let i = 5; i >= 0; i -= 1) {
    a = a * sqrtRt + (A[i] ?? 0);
    b = b * sqrtRt + (B[i] ?? 0);
  }
  return a + ft(t68) * b;
}

function dPss78dSqrtRt(sqrtRt: number, t68: number): number {
  let a = 0;
  let b = 0;
  for (let i = 5; i >= 1; i -= 1) {
    a = a * sqrtRt + i * (A[i] ?? 0);
    b = b * sqrtRt + i * (B[i] ?? 0);
  }
  return a + ft(t68) * b;
}

// Hill, Dauphinee & Woods (1986) low-salinity form, before scaling.
function hillRaw(sPss: number, sqrtRt: number, t68: number): number {
  const x = 400 * sqrtRt * sqrtRt;
  const sqrtY = 10 * sqrtRt;
  return sPss - A[0] / (1 + 1.5 * x + x * x) - (B[0] * ft(t68)) / (1 + sqrtY + sqrtY * sqrtY + sqrtY ** 3);
}

// TEOS-10 scaling: the ratio 2 / Hill(Rt₂), where Rt₂ is the Rt at which PSS-78 gives exactly 2 at
// this temperature, so the extension equals PSS-78 at S = 2. Rt₂ found by Newton's method.
function hillRatioAtS2(t68: number): number {
  let sqrtRt = Math.sqrt(2 / 35);
  for (let i = 0; i < 50; i += 1) {
    const step = (pss78FromSqrtRt(sqrtRt, t68) - 2) / dPss78dSqrtRt(sqrtRt, t68);
    sqrtRt -= step;
    if (Math.abs(step) < 1e-15) break;
  }
  return 2 / hillRaw(2, sqrtRt, t68);
}

/** Practical salinity from the conductivity ratio R = C / C(35,15,0): PSS-78 (UNESCO 1983) with the Hill et al. (1986) extension below S 2. */
export function practicalSalinity({
  conductivityRatio,
  temperatureC,
  pressureDbar = 0,
}: {
  conductivityRatio: number;
  temperatureC: number;
  pressureDbar?: number;
}): number {
  checkRange({ field: 'conductivityRatio', value: conductivityRatio, ...RATIO_RANGE });
  checkRange({
    field: 'temperatureC',
    value: temperatureC,
    ...TEMPERATURE_RANGE_C,
    reason: 'range accepted for PSS-78',
  });
  checkRange({ field: 'pressureDbar', value: pressureDbar, ...PRESSURE_RANGE_DBAR, reason: 'range of PSS-78' });

  const t = t68FromT90(temperatureC);
  const R = conductivityRatio;
  const p = pressureDbar;
  const rt = C[0] + t * (C[1] + t * (C[2] + t * (C[3] + t * C[4])));
  const Rp = 1 + (p * (E[0] + p * (E[1] + p * E[2]))) / (1 + D[0] * t + D[1] * t * t + (D[2] + D[3] * t) * R);
  const Rt = R / (Rp * rt);
  const sqrtRt = Math.sqrt(Rt);
  const sPss = pss78FromSqrtRt(sqrtRt, t);
  if (sPss >= 2) return sPss;
  // Below S 2: Hill et al. (1986), scaled as in TEOS-10. It is 0 at R = 0; floor at 0 against rounding.
  return Math.max(0, hillRatioAtS2(t) * hillRaw(sPss, sqrtRt, t));
}

/** Practical salinity from in-situ conductivity (mS/cm) at the water temperature, surface pressure: PSS-78 / Hill et al. 1986. */
export function salinityFromConductivity({
  conductivityMsCm,
  temperatureC,
}: {
  conductivityMsCm: number;
  temperatureC: number;
}): number {
  checkRange({
    field: 'conductivityMsCm',
    value: conductivityMsCm,
    min: physicalLimits.conductivity.min,
    max: physicalLimits.conductivity.max,
  });
  return practicalSalinity({ conductivityRatio: conductivityMsCm / C35_15_0_MS_CM, temperatureC });
}

/** Practical salinity from specific conductance (mS/cm referenced to 25 °C): PSS-78 / Hill et al. 1986 evaluated at 25 °C. */
export function salinityFromSpecificConductance({
  specificConductanceMsCm,
}: {
  specificConductanceMsCm: number;
}): number {
  checkRange({
    field: 'specificConductanceMsCm',
    value: specificConductanceMsCm,
    min: physicalLimits.specific_conductance.min,
    max: physicalLimits.specific_conductance.max,
  });
  return practicalSalinity({ conductivityRatio: specificConductanceMsCm / C35_15_0_MS_CM, temperatureC: 25 });
}
