import { z } from 'zod';
import { inviteRequestSchema, personSchema, updatePersonSchema } from '../../../shared/schemas/people.schema';
import { defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { FarmsService } from '../farms/farms.service';
import type { PeopleService } from './people.service';

const personParams = farmParams.extend({ userId: z.uuid() });

export function peopleRoutes(people: PeopleService, farms: FarmsService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/people',
      summary: 'People on the farm with their role.',
      tags: ['people'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      response: z.object({ people: z.array(personSchema) }),
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: { people: await people.list(params.farmId) } }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/people',
      summary: 'Invite a person by e-mail (a manager invites hands and planners; an admin anyone).',
      tags: ['people'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      body: inviteRequestSchema,
      response: personSchema,
      example: (f) => ({ params: { farmId: f.farmId! }, body: { email: `new-${crypto.randomUUID().slice(0, 8)}@harrowbend.example`, name: 'New Hand', role: 'hand' } }),
      handler: async ({ params, body, user, farmRole }) => {
        const farm = await farms.get(params.farmId, farmRole ?? 'admin');
        return { status: 201, body: await people.invite(params.farmId, farm.name, body, { id: user!.id, role: farmRole! }) };
      },
    }),
    defineRoute({
      method: 'patch',
      path: '/api/farms/:farmId/people/:userId',
      summary: "Change a person's role or deactivate them (ends their sessions).",
      tags: ['people'],
      access: farmRoles('manager', 'admin'),
      params: personParams,
      body: updatePersonSchema,
      response: personSchema,
      example: (f) => ({ params: { farmId: f.farmId!, userId: f.handId! }, body: { role: 'hand' } }),
      handler: async ({ params, body, user, farmRole }) => ({ body: await people.update(params.farmId, params.userId, body, { id: user!.id, role: farmRole! }) }),
    }),
  ];
}
