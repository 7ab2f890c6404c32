import {
  createFarmRequestSchema,
  farmListResponseSchema,
  farmSchema,
  farmStatusResponseSchema,
  updateFarmRequestSchema,
} from '../../../shared/schemas/farms.schema';
import { unauthorized } from '../../http/errors';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, globalRoles, sessionAccess, type RouteDef } from '../../http/route-registry';
import type { FarmsService } from './farms.service';

export function farmsRoutes(farms: FarmsService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms',
      summary: 'The caller’s farms with their role on each (admins: every farm).',
      tags: ['farms'],
      access: sessionAccess,
      response: farmListResponseSchema,
      example: () => ({}),
      handler: async ({ user }) => {
        if (!user) throw unauthorized();
        return { body: { farms: await farms.listFor(user) } };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms',
      summary: 'Create a farm (admin). Settings not given take the defaults. Audited.',
      tags: ['farms'],
      access: globalRoles('admin'),
      body: createFarmRequestSchema,
      response: farmSchema,
      example: () => ({
        body: { slug: `example-${Math.random().toString(36).slice(2, 8)}`, name: 'Example Farm', timeZone: 'America/Chicago' },
      }),
      handler: async ({ body, user }) => ({ status: 201, body: await farms.create(body, user?.id ?? null) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId',
      summary: 'One farm with every setting (stored values merged over the defaults).',
      tags: ['farms'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: farmSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params, farmRole }) => ({ body: await farms.get(params.farmId, farmRole ?? 'admin') }),
    }),
    defineRoute({
      method: 'patch',
      path: '/api/farms/:farmId',
      summary: 'Change name, time zone (IANA), location, settings (merged) or display defaults. Audited with before and after.',
      tags: ['farms'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      body: updateFarmRequestSchema,
      response: farmSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, body: { settings: { probeWindowMinutes: 30 } } }),
      handler: async ({ params, body, user, farmRole }) => ({
        body: await farms.update(params.farmId, body, user?.id ?? null, farmRole ?? 'admin'),
      }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/status',
      summary:
        'Farm map: every unit with outline, newest probe value per quantity (time, quality), last reading time, status and latest result.',
      tags: ['farms'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: farmStatusResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: await farms.status(params.farmId) }),
    }),
  ];
}
