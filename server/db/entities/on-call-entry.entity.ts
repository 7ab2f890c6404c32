import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** One person on a farm's on-call list, in escalation order, with the local hours they cover. */
@Entity({ name: 'on_call_entries' })
@Index('ix_on_call_entries_farm_position', ['farmId', 'position'])
export class OnCallEntry {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Column({ name: 'user_id', type: 'uuid' }) userId!: string;
  @Column({ type: 'integer' }) position!: number;
  @Column({ name: 'starts_local', type: 'text', default: '00:00' }) startsLocal!: string;
  @Column({ name: 'ends_local', type: 'text', default: '24:00' }) endsLocal!: string;
  /** ISO weekdays 1–7 covered. */
  @Column({ type: 'jsonb', default: () => `'[1,2,3,4,5,6,7]'::jsonb` }) weekdays!: number[];
}
