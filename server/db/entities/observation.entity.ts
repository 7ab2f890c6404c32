import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type ObservationKind = 'water_colour' | 'streaking' | 'off_feed' | 'dead_fish' | 'odour' | 'gasping' | 'other';

@Entity({ name: 'observations' })
@Index('ix_observations_unit_at', ['unitId', 'observedAt'])
export class Observation {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid' }) unitId!: string;
  @Column({ name: 'client_id', type: 'uuid', nullable: true }) clientId!: string | null;
  @Column({ type: 'text' }) kind!: ObservationKind;
  @Column({ type: 'text', nullable: true }) detail!: string | null;
  @Column({ type: 'integer', nullable: true }) count!: number | null;
  @Column({ name: 'photo_path', type: 'text', nullable: true }) photoPath!: string | null;
  @Column({ name: 'observed_at', type: 'timestamptz' }) observedAt!: Date;
  @Column({ name: 'created_by_id', type: 'uuid', nullable: true }) createdById!: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
