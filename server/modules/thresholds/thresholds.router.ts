import { z } from 'zod';
import {
  clearMargins,
  THRESHOLD_CAUTION,
  thresholdProfileListResponseSchema,
  thresholdProfileSchema,
  updateThresholdProfileRequestSchema,
} from '../../../shared/schemas/thresholds.schema';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { ThresholdsService } from './thresholds.service';

const profileParams = farmParams.extend({ profileId: z.uuid() });

export function thresholdRoutes(thresholds: ThresholdsService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/threshold-profiles',
      summary: 'Threshold profiles of the farm: per-species watch and act limits, each rule with its basis and source label, and the units using each.',
      tags: ['thresholds'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: thresholdProfileListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: { profiles: await thresholds.list(params.farmId), caution: THRESHOLD_CAUTION, clearMargins } }),
    }),
    defineRoute({
      method: 'patch',
      path: '/api/farms/:farmId/threshold-profiles/:profileId',
      summary: "Replace a profile's rules (audited with before and after); the units using it are re-evaluated.",
      tags: ['thresholds'],
      access: farmRoles('manager', 'admin'),
      params: profileParams,
      body: updateThresholdProfileRequestSchema,
      response: thresholdProfileSchema,
      example: (f) => ({
        params: { farmId: f.farmId!, profileId: f.thresholdProfileId! },
        body: {
          rules: [{ metric: 'nh3', watch: 0.02, act: 0.05, basis: 'mg/L NH3', source: 'common practice, no source: about 0.02 mg/L NH3 already harms fish' }],
          reason: 'route check',
        },
      }),
      handler: async ({ params, body, user }) => ({ body: await thresholds.update(params.farmId, params.profileId, body, user?.id ?? null) }),
    }),
  ];
}
