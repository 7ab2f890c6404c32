// Two-buffer check of a pH electrode (husbandry.md §5).
import { physicalLimits } from '../units';
import { checkRange } from './errors';

// CODATA 2018 exact values.
const GAS_CONSTANT = 8.314462618; // J/(mol·K)
const FARADAY = 96485.33212; // C/mol
/** Acceptance band: slope 95–105 % of Nernst, offset at pH 7 within ±30 mV (published practice). */
export const PH_ELECTRODE_LIMITS = { slopePct: { min: 95, max: 105 }, offsetMv: { min: -30, max: 30 } } as const;

/** Nernst slope, mV per pH unit: 1000 × ln(10) × R × T / F (59.16 at 25 °C). */
export function nernstSlopeMvPerPh({ temperatureC }: { temperatureC: number }): number {
  checkRange({
    field: 'temperatureC',
    value: temperatureC,
    min: physicalLimits.water_temperature.min,
    max: physicalLimits.water_temperature.max,
  });
  return (1000 * Math.LN10 * GAS_CONSTANT * (temperatureC + 273.15)) / FARADAY;
}

/** Electrode slope as % of the Nernst slope and offset (mV at pH 7) from two buffers (standard two-point calibration). */
export function phElectrodeSlope({
  mV1,
  pH1,
  mV2,
  pH2,
  temperatureC = 25,
}: {
  mV1: number;
  pH1: number;
  mV2: number;
  pH2: number;
  temperatureC?: number;
}): { slopePct: number; offsetMv: number; ok: boolean } {
  const mv = { min: -2000, max: 2000 };
  checkRange({ field: 'mV1', value: mV1, ...mv });
  checkRange({ field: 'mV2', value: mV2, ...mv });
  checkRange({ field: 'pH1', value: pH1, min: 0, max: 14 });
  checkRange({ field: 'pH2', value: pH2, min: 0, max: 14 });
  if (Math.abs(pH1 - pH2) < 0.5) throw new RangeError('phElectrodeSlope needs two buffers at least 0.5 pH apart');
  // The potential falls as pH rises, so the slope in mV/pH is −ΔmV/ΔpH.
  const slopeMvPerPh = -(mV2 - mV1) / (pH2 - pH1);
  const offsetMv = mV1 - slopeMvPerPh * (7 - pH1);
  const slopePct = (slopeMvPerPh / nernstSlopeMvPerPh({ temperatureC })) * 100;
  const { slopePct: s, offsetMv: o } = PH_ELECTRODE_LIMITS;
  return { slopePct, offsetMv, ok: slopePct >= s.min && slopePct <= s.max && offsetMv >= o.min && offsetMv <= o.max };
}
