import { defineRoute, publicAccess, type RouteDef } from '../../http/route-registry';
import type { HealthService } from './health.service';

export function healthRoutes(health: HealthService): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/health',
      summary: 'Database, Redis, MQTT broker and worker status.',
      tags: ['health'],
      access: publicAccess,
      handler: async () => {
        const report = await health.report();
        return { status: report.status === 'ok' ? 200 : 503, body: report };
      },
    }),
  ];
}
