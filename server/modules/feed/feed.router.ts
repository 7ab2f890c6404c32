import { z } from 'zod';
import { addDays } from '../../../shared/farm-time';
import {
  acceptDayResponseSchema,
  acceptDaySchema,
  acceptRecommendationSchema,
  createFeedingSchema,
  dayQuerySchema,
  feedingQuerySchema,
  feedingRecordSchema,
  feedingResponseSchema,
  feedingTableSchema,
  feedRuleResponseSchema,
  overrideRecommendationSchema,
  patchFeedingTableSchema,
  rationSheetSchema,
  recommendationSchema,
  recomputeResponseSchema,
  recomputeSchema,
  unitRationSchema,
  updateFeedRuleSchema,
} from '../../../shared/schemas/feed.schema';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import { presentFeeding, presentRationSheet, presentRecommendation, presentTable, presentUnitRation } from './feed.presenter';
import type { FeedService } from './feed.service';
import type { FeedingTablesService } from './feeding-tables.service';
import type { FeedingsService } from './feedings.service';

const tableParams = farmParams.extend({ tableId: z.uuid() });
const recommendationParams = farmParams.extend({ recommendationId: z.uuid() });
const DECIDERS = ['planner', 'manager', 'admin'] as const;

export function feedRoutes(s: { feed: FeedService; feedTables: FeedingTablesService; feedings: FeedingsService }): RouteDef[] {
  const { feed, feedTables, feedings } = s;
  const sheet = async (farmId: string, day?: string) => presentRationSheet(await feed.rationSheet(farmId, day));
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/feeding-tables',
      summary: 'Feeding tables of the farm, per species, with their source labels.',
      tags: ['feed'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: z.object({ tables: z.array(feedingTableSchema) }),
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: { tables: (await feedTables.list(params.farmId)).map(presentTable) } }),
    }),
    defineRoute({
      method: 'patch',
      path: '/api/farms/:farmId/feeding-tables/:tableId',
      summary: 'Change a feeding table (rows replace the stored rows); audited with before and after; today’s rations are recomputed.',
      tags: ['feed'],
      access: farmRoles(...DECIDERS),
      params: tableParams,
      body: patchFeedingTableSchema,
      response: feedingTableSchema,
      example: (f) => ({ params: { farmId: f.farmId!, tableId: f.feedingTableId! }, body: { reason: 'route check (no change)' } }),
      handler: async ({ params, body, user }) => ({ body: presentTable(await feedTables.patch(params.farmId, params.tableId, body, user?.id ?? null)) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/feed-rule',
      summary: 'The feed-cut rule in force: defaults, the farm’s overrides, the merged rule, its version and sources.',
      tags: ['feed'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: feedRuleResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: { ...(await feedTables.rule(params.farmId)), sources: feedTables.sources() } }),
    }),
    defineRoute({
      method: 'put',
      path: '/api/farms/:farmId/feed-rule',
      summary: 'Replace the farm’s overrides of the feed-cut rule ({} returns to the defaults); audited.',
      tags: ['feed'],
      access: farmRoles('manager', 'planner', 'admin'),
      params: farmParams,
      body: updateFeedRuleSchema,
      response: feedRuleResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, body: { overrides: {} } }),
      handler: async ({ params, body, user }) => ({
        body: { ...(await feedTables.setRule(params.farmId, body.overrides, body.reason, user?.id ?? null)), sources: feedTables.sources() },
      }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/rations',
      summary: 'The ration sheet of a farm-local day (today by default): per unit planned, recommended and approved kg, status, reasons, and what was fed.',
      tags: ['feed'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: dayQuerySchema,
      response: rationSheetSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params, query }) => ({ body: await sheet(params.farmId, query.day) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/rations/recompute',
      summary: 'Recompute the recommendations of every stocked unit for a day now (decided ones keep their decision).',
      tags: ['feed'],
      access: farmRoles(...DECIDERS),
      params: farmParams,
      body: recomputeSchema,
      response: recomputeResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, body: {} }),
      handler: async ({ params, body }) => {
        const r = await feed.recommendFarm(params.farmId, body.day);
        return { body: { day: r.day, computed: r.computed.length, failed: r.failed, sheet: await sheet(params.farmId, r.day) } };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/rations/accept',
      summary: 'Accept every pending recommendation of a day (or of the listed units); audited one by one.',
      tags: ['feed'],
      access: farmRoles(...DECIDERS),
      params: farmParams,
      body: acceptDaySchema,
      response: acceptDayResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, body: { day: f.day! } }),
      handler: async ({ params, body, user }) => {
        const r = await feed.acceptDay(params.farmId, body.day, body.unitIds, user?.id ?? null);
        return { body: { day: r.day, accepted: r.accepted.map(presentRecommendation), skipped: r.skipped.map((x) => ({ id: x.id, unitId: x.unitId, status: x.status })) } };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/ration',
      summary: 'One unit’s ration for a day worked out now: biomass, table row and steps, raceway loading, ammonia load and the proposal, beside the stored recommendation.',
      tags: ['feed'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      query: dayQuerySchema,
      response: unitRationSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params, query }) => {
        const plan = await feed.planUnit(params.farmId, params.unitId, query.day);
        return { body: presentUnitRation(plan, await feed.storedFor(params.unitId, plan.day)) };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/recommendations/:recommendationId',
      summary: 'One feed recommendation with its reasons and every input it used.',
      tags: ['feed'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: recommendationParams,
      response: recommendationSchema,
      example: (f) => ({ params: { farmId: f.farmId!, recommendationId: f.recommendationId! } }),
      handler: async ({ params }) => ({ body: presentRecommendation(await feed.getRecommendation(params.farmId, params.recommendationId)) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/recommendations/:recommendationId/accept',
      summary: 'Accept a recommendation as proposed (the newest proposal, if one came after an earlier decision); audited.',
      tags: ['feed'],
      access: farmRoles(...DECIDERS),
      params: recommendationParams,
      body: acceptRecommendationSchema,
      response: recommendationSchema,
      example: (f) => ({ params: { farmId: f.farmId!, recommendationId: f.recommendationId! }, body: {} }),
      handler: async ({ params, body, user }) => ({ body: presentRecommendation(await feed.accept(params.farmId, params.recommendationId, user?.id ?? null, body.note)) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/recommendations/:recommendationId/override',
      summary: 'Set another ration than recommended, with the reason (required); audited with before and after.',
      tags: ['feed'],
      access: farmRoles(...DECIDERS),
      params: recommendationParams,
      body: overrideRecommendationSchema,
      response: recommendationSchema,
      example: (f) => ({ params: { farmId: f.farmId!, recommendationId: f.recommendationId! }, body: { approvedKg: 250, note: 'route check' } }),
      handler: async ({ params, body, user }) => ({ body: presentRecommendation(await feed.override(params.farmId, params.recommendationId, body, user?.id ?? null)) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units/:unitId/feedings',
      summary:
        'Record what was actually fed on a day (or that feed was withheld). A reason is required when withheld or when the amount differs from the approved ration by more than 10 %. A second record for the day replaces the first (audited).',
      tags: ['feed'],
      access: farmRoles('hand', 'planner', 'manager', 'admin'),
      params: unitParams,
      body: createFeedingSchema,
      response: feedingResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! }, body: { day: addDays(f.day!, -3), fedKg: 10, withheld: false, reason: 'route check', response: 'normal' } }),
      handler: async ({ params, body, user }) => {
        const { feeding, replaced } = await feedings.record(params.farmId, params.unitId, body, user?.id ?? null);
        return { status: replaced ? 200 : 201, body: { feeding: presentFeeding(feeding), replaced } };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/feedings',
      summary: 'What was fed to a unit, day by day.',
      tags: ['feed'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      query: feedingQuerySchema,
      response: z.object({ feedings: z.array(feedingRecordSchema) }),
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params, query }) => ({ body: { feedings: (await feedings.list(params.farmId, params.unitId, query)).map(presentFeeding) } }),
    }),
  ];
}
