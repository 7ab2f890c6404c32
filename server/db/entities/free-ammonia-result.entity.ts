import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type ResultStatus = 'ok' | 'needs_ph' | 'needs_temperature' | 'invalid_input';

@Entity({ name: 'free_ammonia_results' })
@Index('ix_free_ammonia_results_unit_sampled', ['unitId', 'sampledAt'])
export class FreeAmmoniaResult {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index('ux_free_ammonia_results_test', { unique: true })
  @Column({ name: 'water_test_id', type: 'uuid' })
  waterTestId!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid' }) unitId!: string;
  @Column({ name: 'sampled_at', type: 'timestamptz' }) sampledAt!: Date;
  @Column({ type: 'text' }) status!: ResultStatus;
  @Column({ name: 'tan_mg_l', type: 'double precision', nullable: true }) tanMgL!: number | null;
  @Column({ name: 'nh3_n_mg_l', type: 'double precision', nullable: true }) nh3NMgL!: number | null;
  @Column({ name: 'nh3_mg_l', type: 'double precision', nullable: true }) nh3MgL!: number | null;
  @Column({ type: 'double precision', nullable: true }) fraction!: number | null;
  @Column({ name: 'p_ka', type: 'double precision', nullable: true }) pKa!: number | null;
  @Column({ type: 'text', nullable: true }) method!: string | null;
  @Column({ name: 'ph_scale', type: 'text', nullable: true }) pHScale!: string | null;
  @Column({ type: 'double precision', nullable: true }) ph!: number | null;
  @Column({ name: 'temperature_c', type: 'double precision', nullable: true }) temperatureC!: number | null;
  @Column({ name: 'salinity_ppt', type: 'double precision', nullable: true }) salinityPpt!: number | null;
  /** Which readings or handheld values were used, with ids, times and values. */
  @Column({ type: 'jsonb' }) provenance!: Record<string, unknown>;
  /** Kit interference flags, e.g. Nessler after formalin. */
  @Column({ type: 'jsonb', default: () => `'[]'::jsonb` }) flags!: Array<{ code: string; message: string }>;
  @Column({ name: 'forecast_peak', type: 'jsonb', nullable: true }) forecastPeak!: Record<string, unknown> | null;
  @Column({ name: 'test_version', type: 'integer' }) testVersion!: number;
  @Column({ name: 'computed_at', type: 'timestamptz' }) computedAt!: Date;
}
