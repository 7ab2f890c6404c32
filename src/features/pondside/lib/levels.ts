import { NH3_PER_NH3_N, NO2_PER_NO2_N } from '@shared/chemistry';
import { limitsAt, metricDirection, type ThresholdMetric, type ThresholdRuleDto } from '@shared/schemas/thresholds.schema';
import type { Analyte } from '@shared/schemas/water-tests.schema';

export type Level = 'clear' | 'watch' | 'act';

export interface LevelCheck {
  metric: ThresholdMetric;
  level: Level;
  /** The measured value in the rule's basis. */
  value: number;
  watch: number | null;
  act: number | null;
  basis: string;
  source: string;
}

const rank: Record<Level, number> = { clear: 0, watch: 1, act: 2 };
export const worstLevel = (checks: readonly LevelCheck[]): Level | null =>
  checks.length ? checks.reduce<Level>((w, c) => (rank[c.level] > rank[w] ? c.level : w), 'clear') : null;

/** Where a value stands against one rule's watch and act limits (upper limits alarm above, lower below). */
export function levelFor(rule: ThresholdRuleDto, value: number, salinityPpt: number | null): LevelCheck {
  const { watch, act } = limitsAt(rule, salinityPpt);
  const upper = metricDirection[rule.metric] === 'upper';
  const past = (limit: number | null) => limit !== null && (upper ? value >= limit : value <= limit);
  const level: Level = past(act) ? 'act' : past(watch) ? 'watch' : 'clear';
  return { metric: rule.metric, level, value, watch, act, basis: rule.basis, source: rule.source };
}

export interface MeasuredValues {
  analyte: Analyte;
  /** For total ammonia: the computed free ammonia and TAN. */
  nh3MgL?: number | undefined;
  tanMgL?: number | undefined;
  /** For every other analyte: the reading in the schema's unit (°C for temperature). */
  value?: number | undefined;
  basis?: string | undefined;
  salinityPpt?: number | null | undefined;
}

/** Every rule of the unit's profile that applies to this measurement, checked. */
export function checkAgainstRules(rules: readonly ThresholdRuleDto[], m: MeasuredValues): LevelCheck[] {
  const out: LevelCheck[] = [];
  const salinity = m.salinityPpt ?? null;
  for (const rule of rules) {
    const value = valueForRule(rule, m);
    if (value !== undefined) out.push(levelFor(rule, value, salinity));
  }
  return out;
}

function valueForRule(rule: ThresholdRuleDto, m: MeasuredValues): number | undefined {
  switch (rule.metric) {
    case 'nh3':
      if (m.analyte !== 'total_ammonia' || m.nh3MgL === undefined) return undefined;
      return rule.basis === 'mg/L NH3-N' ? m.nh3MgL / NH3_PER_NH3_N : m.nh3MgL;
    case 'tan':
      return m.analyte === 'total_ammonia' ? m.tanMgL : undefined;
    case 'nitrite': {
      if (m.analyte !== 'nitrite' || m.value === undefined) return undefined;
      const asN = m.basis === 'no2' ? m.value / NO2_PER_NO2_N : m.value;
      return rule.basis === 'mg/L NO2' ? asN * NO2_PER_NO2_N : asN;
    }
    case 'do_min':
      return m.analyte === 'dissolved_oxygen' ? m.value : undefined;
    case 'ph_min':
    case 'ph_max':
      return m.analyte === 'ph' ? m.value : undefined;
    case 'temperature_min':
    case 'temperature_max':
      return m.analyte === 'temperature' ? m.value : undefined;
    case 'salinity_max':
      return m.analyte === 'salinity' ? m.value : undefined;
    default:
      return undefined;
  }
}

/** Common practice, no source: about 0.02 mg/L NH3 can already harm fish (product.md). */
export const COMMON_PRACTICE_NH3_MGL = 0.02;
