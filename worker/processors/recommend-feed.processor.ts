import type { JobPayload } from '../../shared/schemas/jobs.schema';
import { registerProcessor, type ProcessorDeps } from './index';

/**
 * Feed recommendations for the farm-local day: one unit, or every stocked unit of the farm. A unit job
 * also fills in stocked units of the farm that have no recommendation for the day yet, so the ration
 * sheet is complete from the first result of the day (and the seeded demo gets one per stocked unit).
 * Idempotent: recommendations are unique per unit and day, and decided ones keep their decision.
 */
export async function recommendFeed(payload: JobPayload<'recommendFeed'>, deps: ProcessorDeps) {
  const { feed } = deps.services;
  if (payload.unitId) {
    const rec = await feed.recommend(payload.farmId, payload.unitId, payload.day);
    const filled = await feed.fillMissing(payload.farmId, rec?.day ?? payload.day);
    if (filled.failed.length) deps.logger.warn({ farmId: payload.farmId, failed: filled.failed }, 'some feed recommendations failed');
    return { unit: rec ? { id: rec.id, action: rec.action, status: rec.status } : null, filled: filled.computed.length };
  }
  const r = await feed.recommendFarm(payload.farmId, payload.day);
  // A unit that fails is retried with the job; the others are already stored (idempotent upserts).
  if (r.failed.length) throw new Error(`feed recommendations failed for ${r.failed.length} unit(s): ${r.failed.map((f) => f.message).join('; ')}`);
  return { day: r.day, computed: r.computed.length };
}

registerProcessor('recommendFeed', (payload, _job, deps) => recommendFeed(payload as JobPayload<'recommendFeed'>, deps));
