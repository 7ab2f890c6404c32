import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { LiveService } from './live.service';

export function liveRoutes(live: LiveService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/events',
      summary: 'Server-sent events for the farm: readings summaries, results, status changes, alerts.',
      tags: ['live'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      kind: 'raw',
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params, req, res }) => {
        res.status(200);
        res.setHeader('Content-Type', 'text/event-stream; charset=utf-8');
        res.setHeader('Cache-Control', 'no-cache, no-transform');
        res.setHeader('Connection', 'keep-alive');
        res.setHeader('X-Accel-Buffering', 'no');
        res.flushHeaders();
        res.write(`retry: 3000\n: connected\n\n`);
        let id = 0;
        const unsubscribe = await live.subscribe(params.farmId, (event) => {
          res.write(`id: ${++id}\nevent: ${event.type}\ndata: ${JSON.stringify(event)}\n\n`);
        });
        const ping = setInterval(() => res.write(`: ping\n\n`), 20_000);
        const end = () => {
          clearInterval(ping);
          unsubscribe();
        };
        req.on('close', end);
        res.on('close', end);
        // Route × role tests only need the headers; they pass ?once=1 to get a closed stream.
        if (req.query.once === '1') res.end();
        return undefined;
      },
    }),
  ];
}
