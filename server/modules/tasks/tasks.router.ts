import { tasksResponseSchema } from '../../../shared/schemas/treatments.schema';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { TasksService } from './tasks.service';

export function taskRoutes(tasks: TasksService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/tasks',
      summary: "Today's tests due and overdue (farm-local day), in walking order.",
      tags: ['tasks'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: tasksResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: await tasks.testsDue(params.farmId) }),
    }),
  ];
}
