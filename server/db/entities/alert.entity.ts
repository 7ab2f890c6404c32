import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type AlertLevel = 'watch' | 'act';
export type AlertState = 'open' | 'acknowledged' | 'resolved';

@Entity({ name: 'alerts' })
@Index('ix_alerts_farm_state', ['farmId', 'state'])
// One alert per open condition: the condition key is unique among alerts not yet resolved.
@Index('ux_alerts_open_condition', ['farmId', 'conditionKey'], { unique: true, where: `"state" <> 'resolved'` })
export class Alert {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid', nullable: true }) unitId!: string | null;
  @Column({ name: 'probe_id', type: 'uuid', nullable: true }) probeId!: string | null;
  @Column({ type: 'text' }) kind!: string;
  @Column({ type: 'text' }) level!: AlertLevel;
  @Column({ type: 'text', default: 'open' }) state!: AlertState;
  @Column({ name: 'condition_key', type: 'text' }) conditionKey!: string;
  @Column({ type: 'text' }) title!: string;
  @Column({ type: 'text' }) message!: string;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) values!: Record<string, unknown>;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) rule!: Record<string, unknown>;
  @Column({ name: 'opened_at', type: 'timestamptz' }) openedAt!: Date;
  @Column({ name: 'last_seen_at', type: 'timestamptz' }) lastSeenAt!: Date;
  @Column({ name: 'clear_since', type: 'timestamptz', nullable: true }) clearSince!: Date | null;
  @Column({ name: 'acknowledged_at', type: 'timestamptz', nullable: true }) acknowledgedAt!: Date | null;
  @Column({ name: 'acknowledged_by_id', type: 'uuid', nullable: true }) acknowledgedById!: string | null;
  @Column({ name: 'assigned_to_id', type: 'uuid', nullable: true }) assignedToId!: string | null;
  @Column({ name: 'resolved_at', type: 'timestamptz', nullable: true }) resolvedAt!: Date | null;
  @Column({ name: 'resolved_by_id', type: 'uuid', nullable: true }) resolvedById!: string | null;
  @Column({ name: 'resolution_note', type: 'text', nullable: true }) resolutionNote!: string | null;
  @Column({ name: 'escalation_step', type: 'integer', default: 0 }) escalationStep!: number;
  @Column({ name: 'next_escalation_at', type: 'timestamptz', nullable: true }) nextEscalationAt!: Date | null;
  @Column({ name: 'realert_at', type: 'timestamptz', nullable: true }) realertAt!: Date | null;
}
