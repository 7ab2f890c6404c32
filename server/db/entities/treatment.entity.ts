import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type TreatmentProduct = 'formalin' | 'copper' | 'salt' | 'lime' | 'ammonia_binder' | 'other';

@Entity({ name: 'treatments' })
@Index('ix_treatments_unit_starts', ['unitId', 'startsAt'])
export class Treatment {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid' }) unitId!: string;
  @Column({ type: 'text' }) product!: TreatmentProduct;
  @Column({ name: 'product_name', type: 'text', nullable: true }) productName!: string | null;
  @Column({ type: 'double precision', nullable: true }) dose!: number | null;
  @Column({ name: 'dose_unit', type: 'text', nullable: true }) doseUnit!: string | null;
  @Column({ name: 'starts_at', type: 'timestamptz' }) startsAt!: Date;
  @Column({ name: 'ends_at', type: 'timestamptz', nullable: true }) endsAt!: Date | null;
  @Column({ name: 'withdrawal_days', type: 'double precision', nullable: true }) withdrawalDays!: number | null;
  @Column({ name: 'withdrawal_degree_days', type: 'double precision', nullable: true }) withdrawalDegreeDays!: number | null;
  /** For day-based withdrawal, fixed; for degree-days, recomputed from logged daily mean temperatures. */
  @Column({ name: 'withdrawal_ends_at', type: 'timestamptz', nullable: true }) withdrawalEndsAt!: Date | null;
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @Column({ name: 'created_by_id', type: 'uuid', nullable: true }) createdById!: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
