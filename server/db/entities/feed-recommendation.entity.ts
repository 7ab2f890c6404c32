import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type FeedAction = 'feed' | 'cut' | 'withhold';
export type RecommendationStatus = 'pending' | 'accepted' | 'overridden';

@Entity({ name: 'feed_recommendations' })
@Index('ux_feed_recommendations_unit_day', ['unitId', 'day'], { unique: true })
@Index('ix_feed_recommendations_farm_day', ['farmId', 'day'])
export class FeedRecommendation {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid' }) unitId!: string;
  /** The farm-local day, YYYY-MM-DD. */
  @Column({ type: 'date' }) day!: string;
  @Column({ name: 'biomass_kg', type: 'double precision' }) biomassKg!: number;
  @Column({ name: 'planned_kg', type: 'double precision' }) plannedKg!: number;
  @Column({ name: 'planned_pct_bw', type: 'double precision' }) plannedPctBw!: number;
  @Column({ type: 'text' }) action!: FeedAction;
  @Column({ name: 'cut_pct', type: 'double precision', default: 0 }) cutPct!: number;
  @Column({ name: 'recommended_kg', type: 'double precision' }) recommendedKg!: number;
  @Column({ type: 'jsonb' }) reasons!: Array<{ code: string; text: string }>;
  @Column({ type: 'jsonb' }) inputs!: Record<string, unknown>;
  @Column({ name: 'rule_version', type: 'text' }) ruleVersion!: string;
  @Column({ type: 'text', default: 'pending' }) status!: RecommendationStatus;
  @Column({ name: 'approved_kg', type: 'double precision', nullable: true }) approvedKg!: number | null;
  @Column({ name: 'override_note', type: 'text', nullable: true }) overrideNote!: string | null;
  @Column({ name: 'decided_by_id', type: 'uuid', nullable: true }) decidedById!: string | null;
  @Column({ name: 'decided_at', type: 'timestamptz', nullable: true }) decidedAt!: Date | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
  @Column({ name: 'computed_at', type: 'timestamptz' }) computedAt!: Date;
}
