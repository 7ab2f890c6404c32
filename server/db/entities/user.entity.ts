import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'users' })
export class User {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index('ux_users_email', { unique: true })
  @Column({ type: 'text' })
  email!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ name: 'password_hash', type: 'text', nullable: true }) passwordHash!: string | null;
  @Column({ name: 'is_admin', type: 'boolean', default: false }) isAdmin!: boolean;
  @Column({ type: 'text', default: 'en' }) locale!: 'en' | 'es';
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) prefs!: Record<string, string>;
  @Column({ type: 'boolean', default: true }) active!: boolean;
  /** Bumped on sign-out-everywhere, password change and deactivation: older tokens stop working. */
  @Column({ name: 'token_version', type: 'integer', default: 0 }) tokenVersion!: number;
  @Column({ name: 'last_login_at', type: 'timestamptz', nullable: true }) lastLoginAt!: Date | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
