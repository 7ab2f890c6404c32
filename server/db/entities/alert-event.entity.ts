import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'alert_events' })
@Index('ix_alert_events_alert_at', ['alertId', 'at'])
export class AlertEvent {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'alert_id', type: 'uuid' }) alertId!: string;
  @Column({ type: 'timestamptz' }) at!: Date;
  @Column({ type: 'text' }) type!: 'opened' | 'escalated_level' | 'acknowledged' | 'assigned' | 'notified' | 'escalated' | 'realerted' | 'resolved';
  @Column({ name: 'user_id', type: 'uuid', nullable: true }) userId!: string | null;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) details!: Record<string, unknown>;
}
