import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type FeedingTableRow = {
  minTemperatureC: number;
  maxTemperatureC: number;
  minWeightG: number;
  maxWeightG: number;
  /** % body weight per day; 0 = do not feed. */
  pctBodyWeightPerDay: number;
  /** Feeding days per week (7 daily, 3.5 every other day, 2 twice a week). */
  daysPerWeek: number;
  note?: string;
};

@Entity({ name: 'feeding_tables' })
@Index('ix_feeding_tables_farm_species', ['farmId', 'species'])
export class FeedingTable {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ type: 'text' }) species!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ type: 'jsonb' }) rows!: FeedingTableRow[];
  /** Where the numbers come from, with the label of the reference (published, from memory, product decision). */
  @Column({ type: 'text' }) source!: string;
  @Column({ name: 'max_kg_per_ha_per_day', type: 'double precision', nullable: true }) maxKgPerHaPerDay!: number | null;
}
