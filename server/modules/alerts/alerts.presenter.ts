import type { AlertDto, AlertEventDto, AlertKind, AlertRule, EvaluationCheck } from '../../../shared/schemas/alerts.schema';
import type { Alert, AlertEvent } from '../../db/entities';
import type { Check } from './alert-rules';

export type AlertLabels = {
  users: Map<string, string>;
  units: Map<string, { code: string; name: string }>;
  probes: Map<string, string>;
};

const person = (id: string | null, names: Map<string, string>) => (id ? { id, name: names.get(id) ?? '(unknown person)' } : null);
const iso = (d: Date | null) => (d ? d.toISOString() : null);

const emptyRule: AlertRule = { metric: null, threshold: null, watch: null, act: null, basis: null, source: '', clearsAt: null, salinityPpt: null, profileId: null, profileName: null };

export function presentAlert(a: Alert, labels: AlertLabels): AlertDto {
  const unit = a.unitId ? labels.units.get(a.unitId) : undefined;
  return {
    id: a.id,
    farmId: a.farmId,
    unitId: a.unitId,
    unitCode: unit?.code ?? null,
    unitName: unit?.name ?? null,
    probeId: a.probeId,
    probeLabel: a.probeId ? (labels.probes.get(a.probeId) ?? null) : null,
    kind: a.kind as AlertKind,
    level: a.level,
    state: a.state,
    conditionKey: a.conditionKey,
    title: a.title,
    message: a.message,
    values: a.values ?? {},
    rule: { ...emptyRule, ...(a.rule as Partial<AlertRule>) },
    openedAt: a.openedAt.toISOString(),
    lastSeenAt: a.lastSeenAt.toISOString(),
    acknowledgedAt: iso(a.acknowledgedAt),
    acknowledgedBy: person(a.acknowledgedById, labels.users),
    assignedTo: person(a.assignedToId, labels.users),
    resolvedAt: iso(a.resolvedAt),
    resolvedBy: person(a.resolvedById, labels.users),
    resolutionNote: a.resolutionNote,
    escalationStep: a.escalationStep,
    nextEscalationAt: iso(a.nextEscalationAt),
    realertAt: iso(a.realertAt),
  };
}

export function presentEvent(e: AlertEvent, users: Map<string, string>): AlertEventDto {
  return { id: e.id, alertId: e.alertId, at: e.at.toISOString(), type: e.type, user: person(e.userId, users), details: e.details ?? {} };
}

export function presentCheck(c: Check): EvaluationCheck {
  return {
    kind: c.kind,
    conditionKey: c.conditionKey,
    verdict: c.verdict,
    level: c.level,
    probeId: c.probeId,
    value: c.value,
    valueUnit: c.valueUnit,
    at: iso(c.at),
    source: c.source,
    rule: c.rule,
    title: c.title,
    message: c.message,
    note: c.note,
    values: jsonSafe(c.values),
  };
}

/** Values a JSON column and a JSON answer can hold: Dates become ISO strings, undefined fields are dropped. */
export function jsonSafe(v: Record<string, unknown>): Record<string, unknown> {
  return JSON.parse(JSON.stringify(v)) as Record<string, unknown>;
}
