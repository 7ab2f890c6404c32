import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

@Entity({ name: 'water_tests' })
@Index('ux_water_tests_farm_client', ['farmId', 'clientId'], { unique: true })
@Index('ix_water_tests_unit_sampled', ['unitId', 'sampledAt'])
export class WaterTest {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'unit_id', type: 'uuid' }) unitId!: string;
  /** Generated on the device so an offline resend stores once. */
  @Column({ name: 'client_id', type: 'uuid' }) clientId!: string;
  @Column({ type: 'text' }) analyte!: string;
  @Column({ type: 'text' }) method!: string;
  @Column({ type: 'text' }) basis!: string;
  @Column({ type: 'double precision' }) value!: number;
  @Column({ type: 'text' }) unit!: string;
  @Column({ name: 'sampled_at', type: 'timestamptz' }) sampledAt!: Date;
  @Column({ name: 'handheld_ph', type: 'double precision', nullable: true }) handheldPh!: number | null;
  @Column({ name: 'handheld_temperature_c', type: 'double precision', nullable: true }) handheldTemperatureC!: number | null;
  @Column({ name: 'handheld_salinity_ppt', type: 'double precision', nullable: true }) handheldSalinityPpt!: number | null;
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @Column({ name: 'photo_path', type: 'text', nullable: true }) photoPath!: string | null;
  @Column({ type: 'text', default: 'pondside' }) source!: 'pondside' | 'api' | 'import' | 'night_round';
  @Column({ name: 'aerator_on', type: 'boolean', nullable: true }) aeratorOn!: boolean | null;
  @Column({ name: 'entered_by_id', type: 'uuid', nullable: true }) enteredById!: string | null;
  /** Bumped on every edit; the stored result records which version it was computed from. */
  @Column({ type: 'integer', default: 1 }) version!: number;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' }) updatedAt!: Date;
}
