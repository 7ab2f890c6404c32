import { In, IsNull, LessThanOrEqual, Not, type DataSource, type FindOptionsWhere } from 'typeorm';
import { Alert, AlertEvent, CultureUnit, Probe, User } from '../../db/entities';

export type NewAlert = Pick<
  Alert,
  'farmId' | 'unitId' | 'probeId' | 'kind' | 'level' | 'conditionKey' | 'title' | 'message' | 'values' | 'rule' | 'openedAt' | 'lastSeenAt'
>;

const OPEN_CONDITION_INDEX = 'ux_alerts_open_condition';

/** True for PostgreSQL's unique violation on the one-open-alert-per-condition index. */
function isOpenConditionConflict(err: unknown): boolean {
  const e = err as { code?: string; constraint?: string; driverError?: { code?: string; constraint?: string } };
  const code = e.code ?? e.driverError?.code;
  const constraint = e.constraint ?? e.driverError?.constraint;
  return code === '23505' && (constraint === undefined || constraint === OPEN_CONDITION_INDEX);
}

export class AlertsRepository {
  constructor(private readonly ds: DataSource) {}

  private get alerts() {
    return this.ds.getRepository(Alert);
  }
  private get events() {
    return this.ds.getRepository(AlertEvent);
  }

  find(farmId: string, alertId: string): Promise<Alert | null> {
    return this.alerts.findOneBy({ id: alertId, farmId });
  }
  findById(alertId: string): Promise<Alert | null> {
    return this.alerts.findOneBy({ id: alertId });
  }
  findOpenByKey(farmId: string, conditionKey: string): Promise<Alert | null> {
    return this.alerts.findOneBy({ farmId, conditionKey, state: Not('resolved') });
  }

  /** Open (not resolved) alerts of a farm, optionally of some units only, or only farm-level ones. */
  openAlerts(farmId: string, scope: { unitIds?: string[]; farmLevel?: boolean } = {}): Promise<Alert[]> {
    const where: FindOptionsWhere<Alert>[] = [];
    if (!scope.unitIds && !scope.farmLevel) where.push({ farmId, state: Not('resolved') });
    if (scope.unitIds?.length) where.push({ farmId, state: Not('resolved'), unitId: In(scope.unitIds) });
    if (scope.farmLevel) where.push({ farmId, state: Not('resolved'), unitId: IsNull() });
    if (!where.length) return Promise.resolve([]);
    return this.alerts.find({ where, order: { openedAt: 'ASC' } });
  }

  /**
   * Inserts a new open alert. Race-safe with several workers: when another process opened the same
   * condition first, the partial unique index refuses the insert and this answers 'exists'.
   */
  async insertOpen(row: NewAlert): Promise<Alert | 'exists'> {
    try {
      const res = await this.alerts.createQueryBuilder().insert().into(Alert).values({ ...row, state: 'open' } as never).returning('*').execute();
      const id = (res.identifiers[0] as { id?: string } | undefined)?.id ?? (res.raw as Array<{ id: string }>)[0]?.id;
      const saved = id ? await this.findById(id) : null;
      if (!saved) throw new Error('alert vanished after insert');
      return saved;
    } catch (err) {
      if (isOpenConditionConflict(err)) return 'exists';
      throw err;
    }
  }

  async updateSeen(alertId: string, patch: Pick<Alert, 'values' | 'rule' | 'title' | 'message' | 'lastSeenAt' | 'unitId' | 'probeId'>): Promise<void> {
    // jsonb columns hold plain records; TypeORM's deep-partial type does not model them.
    await this.alerts.update({ id: alertId, state: Not('resolved') }, patch as never);
  }

  /** watch → act, once: true only for the caller that made the change. */
  async raiseLevel(alertId: string): Promise<boolean> {
    const res = await this.alerts.update({ id: alertId, level: 'watch', state: Not('resolved') }, { level: 'act' });
    return (res.affected ?? 0) > 0;
  }

  /** Resolves unless already resolved; true only for the caller that resolved it. */
  async resolve(alertId: string, by: { userId: string | null; note: string; at: Date }): Promise<boolean> {
    const res = await this.alerts.update(
      { id: alertId, state: Not('resolved') },
      { state: 'resolved', resolvedAt: by.at, resolvedById: by.userId, resolutionNote: by.note, nextEscalationAt: null, realertAt: null },
    );
    return (res.affected ?? 0) > 0;
  }

  /** open → acknowledged: stops the escalation and schedules the re-alert. */
  async acknowledge(farmId: string, alertId: string, userId: string, at: Date, realertAt: Date): Promise<boolean> {
    const res = await this.alerts.update(
      { id: alertId, farmId, state: 'open' },
      { state: 'acknowledged', acknowledgedAt: at, acknowledgedById: userId, nextEscalationAt: null, realertAt },
    );
    return (res.affected ?? 0) > 0;
  }

  async assign(farmId: string, alertId: string, userId: string): Promise<boolean> {
    const res = await this.alerts.update({ id: alertId, farmId, state: Not('resolved') }, { assignedToId: userId });
    return (res.affected ?? 0) > 0;
  }

  /**
   * Claims notification step `to` (= current step + 1) and sets when the next one is due; only one
   * caller wins a step, so two workers never walk the list twice.
   */
  async claimStep(alertId: string, from: number, to: number, nextEscalationAt: Date | null): Promise<boolean> {
    const res = await this.alerts.update({ id: alertId, escalationStep: from, state: Not('resolved') }, { escalationStep: to, nextEscalationAt });
    return (res.affected ?? 0) > 0;
  }

  async stopEscalation(alertId: string): Promise<void> {
    await this.alerts.update({ id: alertId }, { nextEscalationAt: null });
  }

  /** acknowledged → open again when the re-alert time has come (the condition is still there). */
  async reopenForRealert(alertId: string, now: Date): Promise<boolean> {
    const res = await this.alerts.update(
      { id: alertId, state: 'acknowledged', realertAt: LessThanOrEqual(now) },
      { state: 'open', acknowledgedAt: null, acknowledgedById: null, realertAt: null },
    );
    return (res.affected ?? 0) > 0;
  }

  /** acknowledged → open (a watch alert that turned act goes back to the on-call walk). */
  async reopen(alertId: string): Promise<boolean> {
    const res = await this.alerts.update({ id: alertId, state: 'acknowledged' }, { state: 'open', acknowledgedAt: null, acknowledgedById: null, realertAt: null });
    return (res.affected ?? 0) > 0;
  }

  /** Act-level alerts nobody acknowledged whose next escalation step is due (all farms). */
  dueEscalations(now: Date, limit = 200): Promise<Alert[]> {
    return this.alerts.find({ where: { state: 'open', level: 'act', nextEscalationAt: LessThanOrEqual(now) }, order: { nextEscalationAt: 'ASC' }, take: limit });
  }

  dueRealerts(farmId: string, now: Date): Promise<Alert[]> {
    return this.alerts.find({ where: { farmId, state: 'acknowledged', realertAt: LessThanOrEqual(now) }, order: { realertAt: 'ASC' } });
  }

  /** A page of the farm's alerts, newest first (keyset on opened_at, id). */
  async list(
    farmId: string,
    q: { states: Array<Alert['state']>; unitId?: string | undefined; kind?: string | undefined; level?: string | undefined; before?: { at: Date; id: string } | undefined; limit: number },
  ): Promise<Alert[]> {
    const qb = this.alerts.createQueryBuilder('a').where('a.farm_id = :farmId', { farmId }).andWhere('a.state IN (:...states)', { states: q.states });
    if (q.unitId) qb.andWhere('a.unit_id = :unitId', { unitId: q.unitId });
    if (q.kind) qb.andWhere('a.kind = :kind', { kind: q.kind });
    if (q.level) qb.andWhere('a.level = :level', { level: q.level });
    if (q.before) qb.andWhere('(a.opened_at, a.id) < (:at, :id)', { at: q.before.at, id: q.before.id });
    return qb.orderBy('a.opened_at', 'DESC').addOrderBy('a.id', 'DESC').take(q.limit).getMany();
  }

  /** Alerts of a farm opened in [from, to) (the morning report). */
  openedBetween(farmId: string, from: Date, to: Date): Promise<Alert[]> {
    return this.alerts
      .createQueryBuilder('a')
      .where('a.farm_id = :farmId AND a.opened_at >= :from AND a.opened_at < :to', { farmId, from, to })
      .orderBy('a.opened_at', 'ASC')
      .getMany();
  }

  /** Alerts of some kinds that were open at any time in [from, to). */
  openDuring(farmId: string, kinds: string[], from: Date, to: Date): Promise<Alert[]> {
    return this.alerts
      .createQueryBuilder('a')
      .where('a.farm_id = :farmId AND a.kind IN (:...kinds)', { farmId, kinds })
      .andWhere('a.opened_at < :to AND (a.resolved_at IS NULL OR a.resolved_at >= :from)', { from, to })
      .orderBy('a.opened_at', 'ASC')
      .getMany();
  }

  // --- events ---

  async addEvent(row: Pick<AlertEvent, 'alertId' | 'type' | 'userId' | 'details'> & { at?: Date }): Promise<AlertEvent> {
    return this.events.save(this.events.create({ ...row, at: row.at ?? new Date() }));
  }
  eventsOf(alertId: string): Promise<AlertEvent[]> {
    return this.events.find({ where: { alertId }, order: { at: 'ASC', id: 'ASC' } });
  }
  async hasStepEvent(alertId: string, step: number): Promise<boolean> {
    const rows = (await this.ds.query(
      `SELECT 1 FROM alert_events WHERE alert_id = $1 AND type IN ('notified', 'escalated') AND (details->>'step')::int = $2 LIMIT 1`,
      [alertId, step],
    )) as unknown[];
    return rows.length > 0;
  }

  // --- labels for presenting ---

  async userNames(ids: Array<string | null>): Promise<Map<string, string>> {
    const list = [...new Set(ids.filter((v): v is string => Boolean(v)))];
    if (!list.length) return new Map();
    const users = await this.ds.getRepository(User).find({ where: { id: In(list) }, select: { id: true, name: true } });
    return new Map(users.map((u) => [u.id, u.name]));
  }
  async unitLabels(ids: Array<string | null>): Promise<Map<string, { code: string; name: string }>> {
    const list = [...new Set(ids.filter((v): v is string => Boolean(v)))];
    if (!list.length) return new Map();
    const units = await this.ds.getRepository(CultureUnit).find({ where: { id: In(list) }, select: { id: true, code: true, name: true } });
    return new Map(units.map((u) => [u.id, { code: u.code, name: u.name }]));
  }
  async probeLabels(ids: Array<string | null>): Promise<Map<string, string>> {
    const list = [...new Set(ids.filter((v): v is string => Boolean(v)))];
    if (!list.length) return new Map();
    const probes = await this.ds.getRepository(Probe).find({ where: { id: In(list) }, select: { id: true, label: true } });
    return new Map(probes.map((p) => [p.id, p.label]));
  }

  /** Active, deployed probes per unit of a farm (unit status: silent when all of them are). */
  async activeProbesByUnit(farmId: string): Promise<Map<string, string[]>> {
    const probes = await this.ds.getRepository(Probe).find({ where: { farmId, active: true, unitId: Not(IsNull()) }, select: { id: true, unitId: true } });
    const map = new Map<string, string[]>();
    for (const p of probes) if (p.unitId) map.set(p.unitId, [...(map.get(p.unitId) ?? []), p.id]);
    return map;
  }

  /** Whether the farm has this user as a member (or the user is an admin), for assignment. */
  async isFarmPerson(farmId: string, userId: string): Promise<boolean> {
    const rows = (await this.ds.query(
      `SELECT 1 FROM users u LEFT JOIN memberships m ON m.user_id = u.id AND m.farm_id = $1
       WHERE u.id = $2 AND u.active AND (m.id IS NOT NULL OR u.is_admin) LIMIT 1`,
      [farmId, userId],
    )) as unknown[];
    return rows.length > 0;
  }
}
