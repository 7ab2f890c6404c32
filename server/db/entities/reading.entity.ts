import { Column, Entity, PrimaryColumn } from 'typeorm';

export type ReadingQuality = 'good' | 'suspect' | 'bad';

/**
 * One probe value. Values are stored in the canonical unit of their quantity (shared/schemas/mqtt.schema).
 * Growth: the primary key (probe, quantity, time) serves every per-probe range query, and a BRIN index on
 * time keeps farm-wide time scans cheap without the write cost of a second B-tree (docs/architecture.md).
 */
@Entity({ name: 'readings' })
export class Reading {
  @PrimaryColumn({ name: 'probe_id', type: 'uuid', primaryKeyConstraintName: 'pk_readings' }) probeId!: string;
  @PrimaryColumn({ type: 'text', primaryKeyConstraintName: 'pk_readings' }) quantity!: string;
  @PrimaryColumn({ type: 'timestamptz', primaryKeyConstraintName: 'pk_readings' }) at!: Date;
  @Column({ type: 'double precision' }) value!: number;
  @Column({ type: 'text', default: 'good' }) quality!: ReadingQuality;
  @Column({ name: 'received_at', type: 'timestamptz', default: () => 'now()' }) receivedAt!: Date;
}
