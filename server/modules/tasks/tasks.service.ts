import { localDay } from '../../../shared/farm-time';
import type { Task } from '../../../shared/schemas/treatments.schema';
import { notFound } from '../../http/errors';
import type { TasksRepository } from './tasks.repository';
import { testSchedule } from './test-schedule';

export class TasksService {
  constructor(private readonly repo: TasksRepository) {}

  /** Tests due and overdue today (farm-local), in walking order; upcoming ones after them. */
  async testsDue(farmId: string, now = new Date()): Promise<{ day: string; timeZone: string; tests: Task[] }> {
    const farm = await this.repo.findFarm(farmId);
    if (!farm) throw notFound('Farm');
    const [units, last] = await Promise.all([this.repo.units(farmId), this.repo.lastAmmoniaTests(farmId)]);
    const tests: Task[] = [];
    for (const u of units) {
      const lastAt = last.get(u.id) ?? null;
      const s = testSchedule(u, lastAt, now, farm.timeZone);
      if (!s) continue;
      tests.push({
        unitId: u.id,
        code: u.code,
        name: u.name,
        kind: u.kind,
        state: u.state,
        walkOrder: u.walkOrder,
        analyte: 'total_ammonia',
        everyDays: s.everyDays,
        lastTestAt: lastAt?.toISOString() ?? null,
        dueDay: s.dueDay,
        status: s.status,
        daysOverdue: s.daysOverdue,
        reason: s.reason,
      });
    }
    const rank = { overdue: 0, due: 0, upcoming: 1 } as const;
    tests.sort((a, b) => rank[a.status] - rank[b.status] || a.walkOrder - b.walkOrder);
    return { day: localDay(now, farm.timeZone), timeZone: farm.timeZone, tests };
  }
}
