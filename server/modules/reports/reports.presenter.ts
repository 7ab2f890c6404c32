import { morningReportContentSchema, type MorningReportDto } from '../../../shared/schemas/reports.schema';
import type { MorningReport } from '../../db/entities';

export function presentReport(r: MorningReport): MorningReportDto {
  const { mailedTo, mailing: _mailing, ...rest } = r.content as Record<string, unknown> & { mailedTo?: unknown; mailing?: unknown };
  return {
    id: r.id,
    farmId: r.farmId,
    day: typeof r.day === 'string' ? r.day : new Date(r.day as unknown as Date).toISOString().slice(0, 10),
    stored: true,
    createdAt: r.createdAt.toISOString(),
    mailedTo: Array.isArray(mailedTo) ? mailedTo.filter((m): m is string => typeof m === 'string') : [],
    content: morningReportContentSchema.parse(rest),
  };
}
