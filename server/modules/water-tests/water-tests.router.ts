import { z } from 'zod';
import {
  createWaterTestSchema,
  freeAmmoniaResultSchema,
  updateWaterTestSchema,
  waterTestQuerySchema,
  waterTestSchema,
} from '../../../shared/schemas/water-tests.schema';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import { presentResult, presentTest } from './water-tests.presenter';
import type { WaterTestsService } from './water-tests.service';

const testParams = farmParams.extend({ testId: z.uuid() });
const unitTestParams = unitParams.extend({ testId: z.uuid() });
const exampleTest = (clientId: string) => ({ clientId, analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 0.8 });

export function waterTestRoutes(tests: WaterTestsService): RouteDef[] {
  return [
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units/:unitId/tests',
      summary: 'Record a kit or meter result. Idempotent by clientId: an offline resend stores once (200 instead of 201).',
      tags: ['water-tests'],
      access: farmRoles('hand', 'manager', 'admin'),
      params: unitParams,
      body: createWaterTestSchema,
      response: waterTestSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! }, body: exampleTest(crypto.randomUUID()) }),
      handler: async ({ params, body, user }) => {
        const { test, created } = await tests.create(params.farmId, params.unitId, body, user?.id ?? null);
        const { result } = await tests.get(params.farmId, test.id);
        return { status: created ? 201 : 200, body: presentTest(test, result) };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/tests',
      summary: 'Kit and meter results of a unit, newest first, each with its computed free-ammonia result.',
      tags: ['water-tests'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      query: waterTestQuerySchema,
      response: z.object({ tests: z.array(waterTestSchema) }),
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params, query }) => ({
        body: { tests: (await tests.list(params.farmId, params.unitId, query)).map(({ test, result }) => presentTest(test, result)) },
      }),
    }),
    defineRoute({
      method: 'patch',
      path: '/api/farms/:farmId/units/:unitId/tests/:testId',
      summary: 'Correct a result (audited with before and after); the free ammonia is recomputed.',
      tags: ['water-tests'],
      access: farmRoles('hand', 'manager', 'admin'),
      params: unitTestParams,
      body: updateWaterTestSchema,
      response: waterTestSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId!, testId: f.testId! }, body: { value: 0.9, reason: 'misread the colour card' } }),
      handler: async ({ params, body, user }) => {
        const test = await tests.update(params.farmId, params.unitId, params.testId, body, user?.id ?? '');
        return { body: presentTest(test, null) };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/tests/:testId',
      summary: 'One result with its free ammonia (the pondside screen polls this after sending).',
      tags: ['water-tests'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: testParams,
      response: waterTestSchema,
      example: (f) => ({ params: { farmId: f.farmId!, testId: f.testId! } }),
      handler: async ({ params }) => {
        const { test, result } = await tests.get(params.farmId, params.testId);
        return { body: presentTest(test, result) };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/results/latest',
      summary: 'The latest computed free-ammonia result of a unit, with provenance and the forecast peak.',
      tags: ['water-tests'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      response: z.object({ result: freeAmmoniaResultSchema.nullable() }),
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params }) => {
        const r = await tests.latestResult(params.farmId, params.unitId);
        return { body: { result: r ? presentResult(r) : null } };
      },
    }),
  ];
}
