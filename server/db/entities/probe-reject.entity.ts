import { Column, Entity, PrimaryColumn } from 'typeorm';

/** Rejected MQTT payloads counted per probe and reason, for the probe health screen. */
@Entity({ name: 'probe_rejects' })
export class ProbeReject {
  @PrimaryColumn({ name: 'probe_key', type: 'text', primaryKeyConstraintName: 'pk_probe_rejects' }) probeKey!: string;
  @PrimaryColumn({ type: 'text', primaryKeyConstraintName: 'pk_probe_rejects' }) reason!: string;
  @Column({ type: 'bigint', default: 0 }) count!: string;
  @Column({ name: 'last_at', type: 'timestamptz' }) lastAt!: Date;
  @Column({ name: 'last_detail', type: 'text', nullable: true }) lastDetail!: string | null;
}
