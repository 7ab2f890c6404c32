import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** An uploaded aerial image pinned to the map by its four corners (lon/lat, clockwise from top-left). */
@Entity({ name: 'aerial_photos' })
@Index('ix_aerial_photos_farm', ['farmId'])
export class AerialPhoto {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'file_name', type: 'text' }) fileName!: string;
  @Column({ name: 'content_type', type: 'text' }) contentType!: string;
  @Column({ type: 'jsonb' }) corners!: [number, number][];
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
