// Ammonia load from feed and what a flow-through raceway can take (water-chemistry.md §6).
import { physicalLimits } from '../units';
import { type AmmoniaMethod, unionizedFraction } from './ammonia';
import { ChemistryInputError, checkAbove, checkRange } from './errors';

/** kg TAN per kg feed protein: 0.16 N in protein × 0.8 assimilated × 0.8 excreted × 0.9 as TAN (Timmons & Ebeling; from memory). */
export const TAN_PER_KG_PROTEIN = 0.092;
const MINUTES_PER_DAY = 1440;
const MG_PER_KG = 1e6;

// No upper bound on feed: maxFeedKgPerDay may legitimately answer with a very large number when
// ammonia is not what limits a raceway (cold, acid water), and the forward calculation must accept it.
const FEED_RANGE = { min: 0, max: Number.POSITIVE_INFINITY } as const;
const PROTEIN_RANGE = { min: 0, max: 1 } as const;
const FLOW_RANGE = { min: 0, max: physicalLimits.flow.max } as const;

/** TAN produced, kg/day = feed × protein fraction × 0.092 (Timmons & Ebeling, Recirculating Aquaculture; from memory). */
export function tanProductionKgPerDay({
  feedKgPerDay,
  proteinFraction,
}: {
  feedKgPerDay: number;
  proteinFraction: number;
}): number {
  checkRange({ field: 'feedKgPerDay', value: feedKgPerDay, ...FEED_RANGE });
  checkRange({
    field: 'proteinFraction',
    value: proteinFraction,
    ...PROTEIN_RANGE,
    reason: 'a fraction, e.g. 0.40 for 40 %',
  });
  return feedKgPerDay * proteinFraction * TAN_PER_KG_PROTEIN;
}

/** Steady-state TAN rise across a flow-through raceway, no in-unit nitrification: ΔTAN = P × 10⁶ / (Q × 1440) (mass balance; from memory). */
export function racewayTanRiseMgL({
  tanProductionKgPerDay,
  flowLpm,
}: {
  tanProductionKgPerDay: number;
  flowLpm: number;
}): number {
  checkRange({ field: 'tanProductionKgPerDay', value: tanProductionKgPerDay, ...FEED_RANGE });
  checkAbove({ field: 'flowLpm', value: flowLpm, ...FLOW_RANGE, reason: 'a raceway needs inflow' });
  return (tanProductionKgPerDay * MG_PER_KG) / (flowLpm * MINUTES_PER_DAY);
}

/**
 * Most feed (kg/day) a flow-through raceway can take before outlet NH3-N reaches the target: the
 * forward calculation NH3-N = f(pH, t, S) × (inlet TAN + ΔTAN(feed)) solved for feed. Returns 0
 * when the inlet TAN alone already reaches the target.
 */
export function maxFeedKgPerDay({
  targetNh3NMgL,
  inletTanMgL,
  flowLpm,
  proteinFraction,
  pH,
  temperatureC,
  salinityPpt,
  method,
}: {
  /** Target outlet un-ionized ammonia as N (mg NH3-N/L; NH3 = NH3-N × 1.21588). */
  targetNh3NMgL: number;
  inletTanMgL: number;
  flowLpm: number;
  proteinFraction: number;
  pH: number;
  temperatureC: number;
  salinityPpt: number;
  method?: AmmoniaMethod;
}): number {
  checkRange({ field: 'targetNh3NMgL', value: targetNh3NMgL, min: 0, max: 100 });
  checkRange({ field: 'inletTanMgL', value: inletTanMgL, min: 0, max: 1e4 });
  checkAbove({ field: 'flowLpm', value: flowLpm, ...FLOW_RANGE, reason: 'a raceway needs inflow' });
  checkAbove({
    field: 'proteinFraction',
    value: proteinFraction,
    ...PROTEIN_RANGE,
    reason: 'a fraction, e.g. 0.40 for 40 %',
  });
  const { fraction } = unionizedFraction({ pH, temperatureC, salinityPpt, ...(method ? { method } : {}) });
  const allowedTanMgL = targetNh3NMgL / fraction;
  const allowedRiseMgL = allowedTanMgL - inletTanMgL;
  if (!(allowedRiseMgL > 0)) return 0;
  const allowedTanKgPerDay = (allowedRiseMgL * flowLpm * MINUTES_PER_DAY) / MG_PER_KG;
  const feed = allowedTanKgPerDay / (proteinFraction * TAN_PER_KG_PROTEIN);
  if (!Number.isFinite(feed)) {
    // Only reachable with an extreme target at a vanishing fraction (very low pH and temperature).
    throw new ChemistryInputError({
      field: 'pH',
      min: 0,
      max: 14,
      value: pH,
      reason: 'free-ammonia fraction too small to solve for feed',
    });
  }
  return feed;
}
