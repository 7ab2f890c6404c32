import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** Hand-measured or design flows; probe flows live in readings. Flow has a history, never one field. */
@Entity({ name: 'flow_measurements' })
@Index('ix_flow_measurements_unit_at', ['unitId', 'measuredAt'])
export class FlowMeasurement {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid' }) unitId!: string;
  @Column({ name: 'measured_at', type: 'timestamptz' }) measuredAt!: Date;
  @Column({ name: 'flow_lpm', type: 'double precision' }) flowLpm!: number;
  @Column({ type: 'text', default: 'manual' }) source!: 'manual' | 'design';
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @Column({ name: 'recorded_by_id', type: 'uuid', nullable: true }) recordedById!: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
