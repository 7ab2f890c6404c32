import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'audit_events' })
@Index('ix_audit_events_farm_at', ['farmId', 'at'])
export class AuditEvent {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid', nullable: true }) farmId!: string | null;
  @Column({ name: 'actor_id', type: 'uuid', nullable: true }) actorId!: string | null;
  @Column({ type: 'timestamptz' }) at!: Date;
  @Column({ type: 'text' }) action!: string;
  @Column({ type: 'text' }) entity!: string;
  @Column({ name: 'entity_id', type: 'text', nullable: true }) entityId!: string | null;
  @Column({ type: 'jsonb', nullable: true }) before!: Record<string, unknown> | null;
  @Column({ type: 'jsonb', nullable: true }) after!: Record<string, unknown> | null;
}
