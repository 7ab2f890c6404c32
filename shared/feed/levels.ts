// Free-ammonia levels of a threshold profile, expressed as NH3 (mg/L) whatever basis the profile uses.
import { NH3_PER_NH3_N } from '../units';

export type ProfileRule = {
  metric: string;
  watch: number | null;
  act: number | null;
  basis: string;
  source: string;
  bySalinity?: Array<{ salinityPpt: number; act: number; watch?: number }> | undefined;
};

/** Linear interpolation over salinity points, held flat outside them. */
function bySalinity(points: Array<{ salinityPpt: number; value: number }>, salinityPpt: number): number | null {
  const sorted = [...points].sort((a, b) => a.salinityPpt - b.salinityPpt);
  if (!sorted.length) return null;
  if (salinityPpt <= sorted[0]!.salinityPpt) return sorted[0]!.value;
  for (let i = 1; i < sorted.length; i++) {
    const a = sorted[i - 1]!;
    const b = sorted[i]!;
    if (salinityPpt <= b.salinityPpt) return a.value + ((b.value - a.value) * (salinityPpt - a.salinityPpt)) / (b.salinityPpt - a.salinityPpt);
  }
  return sorted[sorted.length - 1]!.value;
}

export type Nh3Levels = { watchNh3MgL: number | null; actNh3MgL: number | null; basis: string; source: string };

/**
 * The watch and act NH3 levels of a profile's `nh3` rule at a salinity. Levels given as NH3-N are
 * converted (NH3 = NH3-N × 1.21588). Salinity-dependent act levels are interpolated; their watch
 * level keeps the rule's watch : act ratio unless the point gives its own.
 */
export function nh3Levels(rules: ProfileRule[], salinityPpt: number): Nh3Levels | null {
  const rule = rules.find((r) => r.metric === 'nh3');
  if (!rule) return null;
  const asN = /nh3-n/i.test(rule.basis);
  const toNh3 = (v: number | null) => (v === null ? null : asN ? v * NH3_PER_NH3_N : v);
  let act = rule.act;
  let watch = rule.watch;
  if (rule.bySalinity?.length) {
    act = bySalinity(rule.bySalinity.map((p) => ({ salinityPpt: p.salinityPpt, value: p.act })), salinityPpt);
    const ownWatch = rule.bySalinity.every((p) => p.watch !== undefined)
      ? bySalinity(rule.bySalinity.map((p) => ({ salinityPpt: p.salinityPpt, value: p.watch! })), salinityPpt)
      : null;
    watch = ownWatch ?? (act !== null && rule.watch !== null && rule.act ? (act * rule.watch) / rule.act : null);
  }
  return { watchNh3MgL: toNh3(watch), actNh3MgL: toNh3(act), basis: rule.basis, source: rule.source };
}
