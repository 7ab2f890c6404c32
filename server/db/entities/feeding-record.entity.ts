import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** What was actually fed (or withheld, and why): the record auditors ask for. */
@Entity({ name: 'feeding_records' })
@Index('ix_feeding_records_unit_day', ['unitId', 'day'])
export class FeedingRecord {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid' }) unitId!: string;
  @Column({ type: 'date' }) day!: string;
  @Column({ name: 'fed_kg', type: 'double precision' }) fedKg!: number;
  @Column({ type: 'boolean', default: false }) withheld!: boolean;
  @Column({ type: 'text', nullable: true }) reason!: string | null;
  @Column({ type: 'text', nullable: true }) response!: 'eager' | 'normal' | 'slow' | 'refused' | null;
  @Column({ name: 'fed_at', type: 'timestamptz' }) fedAt!: Date;
  @Column({ name: 'recorded_by_id', type: 'uuid', nullable: true }) recordedById!: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
