import { z } from 'zod';
import { createTreatmentSchema, treatmentSchema, withdrawalSchema } from '../../../shared/schemas/treatments.schema';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import { presentTreatment } from './treatments.presenter';
import type { TreatmentsService } from './treatments.service';

export function treatmentRoutes(treatments: TreatmentsService): RouteDef[] {
  return [
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units/:unitId/treatments',
      summary: 'Log a treatment with its withdrawal period (days or degree-days).',
      tags: ['treatments'],
      access: farmRoles('hand', 'manager', 'admin'),
      params: unitParams,
      body: createTreatmentSchema,
      response: treatmentSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! }, body: { product: 'salt', dose: 3, doseUnit: 'g/L', startsAt: new Date().toISOString() } }),
      handler: async ({ params, body, user }) => {
        const { treatment, withdrawal } = await treatments.create(params.farmId, params.unitId, body, user?.id ?? null);
        return { status: 201, body: presentTreatment(treatment, withdrawal) };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/treatments',
      summary: 'Treatments of a unit, newest first, each with its withdrawal status.',
      tags: ['treatments'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      response: z.object({ treatments: z.array(treatmentSchema), withdrawal: withdrawalSchema }),
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params }) => {
        const rows = await treatments.list(params.farmId, params.unitId);
        const withdrawal = await treatments.withdrawalStatus(params.farmId, params.unitId);
        return { body: { treatments: rows.map((r) => presentTreatment(r.treatment, r.withdrawal)), withdrawal } };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/treatments',
      summary: 'Treatments on the whole farm with withdrawal ends (records and harvest planning).',
      tags: ['treatments'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: z.object({ treatments: z.array(treatmentSchema) }),
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: { treatments: (await treatments.listFarm(params.farmId)).map((r) => presentTreatment(r.treatment, r.withdrawal)) } }),
    }),
  ];
}
