import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'morning_reports' })
@Index('ux_morning_reports_farm_day', ['farmId', 'day'], { unique: true })
export class MorningReport {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ type: 'date' }) day!: string;
  @Column({ type: 'jsonb' }) content!: Record<string, unknown>;
  @Column({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
