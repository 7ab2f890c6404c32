import { z } from 'zod';
import { globalOutboxQuerySchema, outboxDetailSchema, outboxListSchema, outboxQuerySchema } from '../../../shared/schemas/outbox.schema';
import { defineRoute, farmParams, farmRoles, globalRoles, type RouteDef } from '../../http/route-registry';
import { presentDetail, presentList } from './outbox.presenter';
import type { OutboxService } from './outbox.service';

const messageParams = z.object({ messageId: z.uuid() });
const farmMessageParams = farmParams.extend({ messageId: z.uuid() });

export function outboxRoutes(outbox: OutboxService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/outbox',
      summary:
        "The e-mails this farm's notifications produced, newest first, each paired with the mail catcher's received copy " +
        "(delivery: received | not_found | not_sent | unknown when the catcher does not answer). Paged with ?cursor=.",
      tags: ['outbox'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      query: outboxQuerySchema,
      response: outboxListSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params, query }) => ({ body: presentList(await outbox.list({ farmId: params.farmId }, query)) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/outbox/:messageId',
      summary: 'One outbox message: the text handed to the mail provider and the text the catcher received.',
      tags: ['outbox'],
      access: farmRoles('manager', 'admin'),
      params: farmMessageParams,
      response: outboxDetailSchema,
      example: (f) => ({ params: { farmId: f.farmId!, messageId: f.outboxMessageId! } }),
      handler: async ({ params }) => ({ body: presentDetail(await outbox.get(params.messageId, params.farmId)) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/outbox',
      summary: 'Admins: messages that belong to no farm (password resets, invitations) with ?scope=farmless (default), or every message with ?scope=all.',
      tags: ['outbox'],
      access: globalRoles('admin'),
      query: globalOutboxQuerySchema,
      response: outboxListSchema,
      example: () => ({}),
      handler: async ({ query }) => ({ body: presentList(await outbox.list(query.scope === 'all' ? { all: true } : { farmless: true }, query)) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/outbox/:messageId',
      summary: 'Admins: any one outbox message with the sent and the received text.',
      tags: ['outbox'],
      access: globalRoles('admin'),
      params: messageParams,
      response: outboxDetailSchema,
      example: (f) => ({ params: { messageId: f.farmlessOutboxMessageId! } }),
      handler: async ({ params }) => ({ body: presentDetail(await outbox.get(params.messageId, undefined)) }),
    }),
  ];
}
