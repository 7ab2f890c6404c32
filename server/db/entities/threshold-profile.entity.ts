import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

export type ThresholdRule = {
  metric: 'nh3' | 'tan' | 'nitrite' | 'ph_min' | 'ph_max' | 'temperature_min' | 'temperature_max' | 'do_min' | 'flow_min' | 'salinity_max';
  watch: number | null;
  act: number | null;
  /** What the numbers are in, e.g. 'mg/L NH3', 'mg/L NH3-N', 'mg/L TAN', '°C', 'L/min'. */
  basis: string;
  source: string;
  /** Salinity-dependent limits (e.g. shrimp), interpolated linearly at the unit's salinity. */
  bySalinity?: Array<{ salinityPpt: number; act: number; watch?: number }>;
};

@Entity({ name: 'threshold_profiles' })
@Index('ix_threshold_profiles_farm', ['farmId'])
export class ThresholdProfile {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ type: 'text' }) species!: string;
  @Column({ name: 'life_stage', type: 'text', nullable: true }) lifeStage!: string | null;
  @Column({ type: 'jsonb' }) rules!: ThresholdRule[];
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' }) updatedAt!: Date;
}
