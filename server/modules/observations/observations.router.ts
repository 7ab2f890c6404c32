import { z } from 'zod';
import { createObservationSchema, observationSchema } from '../../../shared/schemas/treatments.schema';
import type { Observation } from '../../db/entities';
import { ANY_FARM_ROLE, defineRoute, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import type { ObservationsService } from './observations.service';

const present = (o: Observation, closeWatchUntil: Date | null) => ({
  id: o.id,
  unitId: o.unitId,
  kind: o.kind,
  detail: o.detail,
  count: o.count,
  photoUrl: o.photoPath ? `/api/farms/${o.farmId}/photos/${o.photoPath}` : null,
  observedAt: o.observedAt.toISOString(),
  createdById: o.createdById,
  closeWatchUntil: closeWatchUntil?.toISOString() ?? null,
});

export function observationRoutes(observations: ObservationsService): RouteDef[] {
  return [
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units/:unitId/observations',
      summary: 'Log an observation (water colour, streaking, fish off feed, dead fish, odour, gasping). Die-off signs put the unit on closer watch.',
      tags: ['observations'],
      access: farmRoles('hand', 'manager', 'planner', 'admin'),
      params: unitParams,
      body: createObservationSchema,
      response: observationSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! }, body: { kind: 'water_colour', detail: 'light green' } }),
      handler: async ({ params, body, user }) => {
        const { observation, closeWatchUntil, created } = await observations.create(params.farmId, params.unitId, body, user?.id ?? null);
        return { status: created ? 201 : 200, body: present(observation, closeWatchUntil) };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/observations',
      summary: 'Observations of a unit, newest first.',
      tags: ['observations'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      response: z.object({ observations: z.array(observationSchema) }),
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params }) => ({ body: { observations: (await observations.list(params.farmId, params.unitId)).map((o) => present(o, null)) } }),
    }),
  ];
}
