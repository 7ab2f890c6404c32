import type { AuditEventDto } from '../../../shared/schemas/audit.schema';
import type { AuditRow } from './audit.repository';

export function presentAuditEvent(e: AuditRow): AuditEventDto {
  return {
    id: e.id,
    farmId: e.farmId,
    at: e.at.toISOString(),
    action: e.action,
    entity: e.entity,
    entityId: e.entityId,
    actor: e.actorId ? { id: e.actorId, name: e.actorName ?? '(removed user)', email: e.actorEmail ?? '' } : null,
    before: e.before,
    after: e.after,
  };
}
