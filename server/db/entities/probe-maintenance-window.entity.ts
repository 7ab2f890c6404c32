import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** While a probe is out for cleaning or calibration it raises no silence or quality alarms. */
@Entity({ name: 'probe_maintenance_windows' })
@Index('ix_probe_maintenance_windows_probe', ['probeId', 'startsAt'])
export class ProbeMaintenanceWindow {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'probe_id', type: 'uuid' }) probeId!: string;
  @Column({ name: 'starts_at', type: 'timestamptz' }) startsAt!: Date;
  @Column({ name: 'ends_at', type: 'timestamptz' }) endsAt!: Date;
  @Column({ type: 'text' }) reason!: string;
  @Column({ name: 'created_by_id', type: 'uuid', nullable: true }) createdById!: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
