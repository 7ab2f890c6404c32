import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import type { Quantity } from '../../../shared/schemas/mqtt.schema';

@Entity({ name: 'probes' })
@Index('ix_probes_unit', ['unitId'])
export class Probe {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid', nullable: true }) unitId!: string | null;
  /** MQTT username and topic segment. */
  @Index('ux_probes_probe_key', { unique: true })
  @Column({ name: 'probe_key', type: 'text' })
  probeKey!: string;
  @Column({ type: 'text' }) label!: string;
  @Column({ type: 'text', nullable: true }) model!: string | null;
  @Column({ type: 'jsonb', default: () => `'[]'::jsonb` }) quantities!: Quantity[];
  @Column({ name: 'interval_seconds', type: 'integer', default: 60 }) intervalSeconds!: number;
  @Column({ name: 'secret_hash', type: 'text' }) secretHash!: string;
  @Column({ name: 'secret_rotated_at', type: 'timestamptz' }) secretRotatedAt!: Date;
  @Column({ type: 'boolean', default: true }) active!: boolean;
  @Column({ name: 'last_seen_at', type: 'timestamptz', nullable: true }) lastSeenAt!: Date | null;
  @Column({ name: 'battery_pct', type: 'double precision', nullable: true }) batteryPct!: number | null;
  @Column({ name: 'rssi_dbm', type: 'double precision', nullable: true }) rssiDbm!: number | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
