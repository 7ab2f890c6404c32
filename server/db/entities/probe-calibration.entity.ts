import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'probe_calibrations' })
@Index('ix_probe_calibrations_probe_at', ['probeId', 'performedAt'])
export class ProbeCalibration {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'probe_id', type: 'uuid' }) probeId!: string;
  @Column({ type: 'text' }) quantity!: string;
  @Column({ name: 'performed_at', type: 'timestamptz' }) performedAt!: Date;
  @Column({ name: 'performed_by_id', type: 'uuid', nullable: true }) performedById!: string | null;
  @Column({ type: 'text' }) method!: string;
  /** Buffers, mV, slope, offset, standard values: whatever the calibration recorded. */
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) details!: Record<string, unknown>;
  @Column({ type: 'boolean' }) passed!: boolean;
  @Column({ name: 'next_due_at', type: 'timestamptz' }) nextDueAt!: Date;
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
