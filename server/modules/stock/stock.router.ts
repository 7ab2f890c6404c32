import { z } from 'zod';
import {
  createStockEventResponseSchema,
  createStockEventSchema,
  farmStockSchema,
  stockEventQuerySchema,
  stockEventSchema,
  unitStockSchema,
} from '../../../shared/schemas/stock.schema';
import { forbidden } from '../../http/errors';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import { presentFarmStock, presentStockEvent, presentUnitStock } from './stock.presenter';
import type { StockService } from './stock.service';

export function stockRoutes(stock: StockService): RouteDef[] {
  return [
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units/:unitId/stock-events',
      summary:
        'Record a stock event (stocking, transfer out with the receiving unit, mortality, sample weighing, harvest). Hands may record mortalities only. Harvest and transfer are refused (409) during a withdrawal period.',
      tags: ['stock'],
      access: farmRoles('hand', 'planner', 'manager', 'admin'),
      params: unitParams,
      body: createStockEventSchema,
      response: createStockEventResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! }, body: { kind: 'mortality', count: 1, note: 'route check' } }),
      handler: async ({ params, body, user, farmRole }) => {
        if (farmRole === 'hand' && body.kind !== 'mortality') throw forbidden('Hands record mortalities; ask the planner or manager to record other stock events.');
        const { event, related } = await stock.record(params.farmId, params.unitId, body, user?.id ?? null);
        return { status: 201, body: { event: presentStockEvent(event), related: related ? presentStockEvent(related) : null } };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/stock-events',
      summary: 'Stock events of a unit, oldest first.',
      tags: ['stock'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      query: stockEventQuerySchema,
      response: z.object({ events: z.array(stockEventSchema) }),
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params, query }) => ({ body: { events: (await stock.list(params.farmId, params.unitId, query)).map(presentStockEvent) } }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/units/:unitId/stock',
      summary:
        'Stock history of a unit with its state after every event, the current biomass (mean weight from the latest weighing, no growth added, 95 % interval, age, density) and FCR between weighings with its uncertainty.',
      tags: ['stock'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: unitParams,
      response: unitStockSchema,
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId! } }),
      handler: async ({ params }) => ({ body: presentUnitStock(await stock.unitStock(params.farmId, params.unitId)) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/stock',
      summary: 'Current biomass, density and latest FCR of every unit of the farm.',
      tags: ['stock'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      response: farmStockSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => {
        const asOf = new Date();
        return { body: presentFarmStock(asOf, await stock.farmStock(params.farmId, asOf)) };
      },
    }),
  ];
}
