import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { FarmRole } from '../../../shared/schemas/auth.schema';
import { Farm } from './farm.entity';
import { User } from './user.entity';

@Entity({ name: 'memberships' })
@Index('ux_memberships_farm_user', ['farmId', 'userId'], { unique: true })
export class Membership {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid' }) farmId!: string;
  @Index('ix_memberships_user')
  @Column({ name: 'user_id', type: 'uuid' })
  userId!: string;
  @Column({ type: 'text' }) role!: FarmRole;
  @ManyToOne(() => Farm, { onDelete: 'CASCADE' }) @JoinColumn({ name: 'farm_id' }) farm?: Farm;
  @ManyToOne(() => User, { onDelete: 'CASCADE' }) @JoinColumn({ name: 'user_id' }) user?: User;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
