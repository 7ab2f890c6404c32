import {
  createFlowRequestSchema,
  createUnitRequestSchema,
  flowListQuerySchema,
  flowListResponseSchema,
  flowMeasurementSchema,
  labelParamsSchema,
  labelResolveResponseSchema,
  unitLabelResponseSchema,
  unitListQuerySchema,
  unitListResponseSchema,
  unitSchema,
  updateUnitRequestSchema,
} from '../../../shared/schemas/units.schema';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import type { UnitsService } from './units.service';

const uniqueCode = () => `X${Math.random().toString(36).slice(2, 8).toUpperCase()}`;
const square = (lon: number, lat: number, d = 0.0005) => ({
  type: 'Polygon' as const,
  coordinates: [
    [
      [lon, lat],
      [lon + d, lat],
      [lon + d, lat + d],
      [lon, lat + d],
      [lon, lat],
    ],
  ],
});

export function unitsRoutes(units: UnitsService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units',
      summary: 'Units of the farm in walking order (filter by kind or state).',
      tags: ['units'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: unitListQuerySchema,
      response: unitListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params, query }) => ({ body: { units: await units.list(params.farmId, query) } }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units',
      summary:
        'Create a unit (pond, raceway or tank). The area is computed from the outline when not given; a QR label id is generated. Audited.',
      tags: ['units'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      body: createUnitRequestSchema,
      response: unitSchema,
      example: (f) => ({
        params: { farmId: f.farmId! },
        body: { code: uniqueCode(), name: 'Example pond', kind: 'pond', outline: square(-91.0, 33.2) },
      }),
      handler: async ({ params, body, user }) => ({ status: 201, body: await units.create(params.farmId, body, user?.id ?? null) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId',
      summary: 'One unit.',
      tags: ['units'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      response: unitSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params }) => ({ body: await units.get(params.farmId, params.unitId) }),
    }),
    defineRoute({
      method: 'patch',
      path: '/api/farms/:farmId/units/:unitId',
      summary:
        'Change a unit: only the fields sent change. A new outline without an area recomputes the area. Audited with before and after.',
      tags: ['units'],
      access: farmRoles('manager', 'admin'),
      params: unitParams,
      body: updateUnitRequestSchema,
      response: unitSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! }, body: { testFrequencyDays: 7 } }),
      handler: async ({ params, body, user }) => ({ body: await units.update(params.farmId, params.unitId, body, user?.id ?? null) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/label',
      summary: 'The unit’s QR label: the URL it encodes (pondside test screen) and the code as SVG.',
      tags: ['units'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      response: unitLabelResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params }) => ({ body: await units.label(params.farmId, params.unitId) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/labels/:qrLabelId',
      summary: 'Resolve a scanned QR label id to its unit on this farm.',
      tags: ['units'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: labelParamsSchema,
      response: labelResolveResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, qrLabelId: f.qrLabelId! } }),
      handler: async ({ params }) => ({ body: await units.resolveLabel(params.farmId, params.qrLabelId) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/flows',
      summary:
        'Flow history of a unit (manual and design measurements, newest first) and the flow that counts now (newest of probe and measurements).',
      tags: ['units'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      query: flowListQuerySchema,
      response: flowListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params, query }) => ({ body: await units.listFlows(params.farmId, params.unitId, query.limit) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units/:unitId/flows',
      summary: 'Record a flow measurement (hands may record manual ones; the design flow is for managers and admins). Audited.',
      tags: ['units'],
      access: farmRoles('hand', 'manager', 'admin'),
      params: unitParams,
      body: createFlowRequestSchema,
      response: flowMeasurementSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! }, body: { flowLpm: 2400, note: 'bucket and stopwatch' } }),
      handler: async ({ params, body, user, farmRole }) => ({
        status: 201,
        body: await units.addFlow(params.farmId, params.unitId, body, { id: user?.id ?? null, role: farmRole }),
      }),
    }),
  ];
}
