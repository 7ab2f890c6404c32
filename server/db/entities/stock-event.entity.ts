import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type StockEventKind = 'stocking' | 'transfer_in' | 'transfer_out' | 'mortality' | 'sample_weighing' | 'harvest';

@Entity({ name: 'stock_events' })
@Index('ix_stock_events_unit_at', ['unitId', 'at'])
export class StockEvent {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid' }) unitId!: string;
  @Column({ type: 'text' }) kind!: StockEventKind;
  @Column({ type: 'timestamptz' }) at!: Date;
  @Column({ type: 'integer', nullable: true }) count!: number | null;
  @Column({ name: 'total_weight_kg', type: 'double precision', nullable: true }) totalWeightKg!: number | null;
  @Column({ name: 'mean_weight_g', type: 'double precision', nullable: true }) meanWeightG!: number | null;
  @Column({ name: 'sample_size', type: 'integer', nullable: true }) sampleSize!: number | null;
  @Column({ name: 'sample_sd_g', type: 'double precision', nullable: true }) sampleSdG!: number | null;
  @Column({ name: 'mean_length_cm', type: 'double precision', nullable: true }) meanLengthCm!: number | null;
  @Column({ name: 'related_unit_id', type: 'uuid', nullable: true }) relatedUnitId!: string | null;
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @Column({ name: 'created_by_id', type: 'uuid', nullable: true }) createdById!: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
