import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

export type UnitKind = 'pond' | 'raceway' | 'tank';
export type WaterType = 'fresh' | 'brackish' | 'marine';
export type UnitState = 'active' | 'cycling' | 'fallow';
export type GeoJsonPolygon = { type: 'Polygon'; coordinates: number[][][] };

@Entity({ name: 'culture_units' })
@Index('ux_culture_units_farm_code', ['farmId', 'code'], { unique: true })
export class CultureUnit {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ type: 'text' }) code!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ type: 'text' }) kind!: UnitKind;
  @Column({ type: 'jsonb', nullable: true }) outline!: GeoJsonPolygon | null;
  @Column({ name: 'area_m2', type: 'double precision', nullable: true }) areaM2!: number | null;
  @Column({ name: 'volume_m3', type: 'double precision', nullable: true }) volumeM3!: number | null;
  @Column({ name: 'water_type', type: 'text', default: 'fresh' }) waterType!: WaterType;
  @Column({ name: 'default_salinity_ppt', type: 'double precision', default: 0 }) defaultSalinityPpt!: number;
  @Column({ type: 'text', nullable: true }) species!: string | null;
  @Column({ name: 'life_stage', type: 'text', nullable: true }) lifeStage!: string | null;
  @Column({ type: 'text', default: 'active' }) state!: UnitState;
  /** Days between routine ammonia tests; null = the rule for its state (cycling daily, established weekly). */
  @Column({ name: 'test_frequency_days', type: 'integer', nullable: true }) testFrequencyDays!: number | null;
  @Index('ux_culture_units_qr_label', { unique: true })
  @Column({ name: 'qr_label_id', type: 'text' })
  qrLabelId!: string;
  @Column({ name: 'walk_order', type: 'integer', default: 0 }) walkOrder!: number;
  @Column({ name: 'threshold_profile_id', type: 'uuid', nullable: true }) thresholdProfileId!: string | null;
  /** Crude protein fraction of the feed in use, for the ammonia load. */
  @Column({ name: 'feed_protein_fraction', type: 'double precision', default: 0.32 }) feedProteinFraction!: number;
  /** Until when the unit is under closer watch (after a die-off sign): tests due daily. */
  @Column({ name: 'close_watch_until', type: 'timestamptz', nullable: true }) closeWatchUntil!: Date | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' }) updatedAt!: Date;
}
