import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'password_reset_tokens' })
export class PasswordResetToken {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index('ix_password_reset_tokens_user')
  @Column({ name: 'user_id', type: 'uuid' })
  userId!: string;
  /** SHA-256 of the token; the token itself only ever exists in the e-mail. */
  @Index('ux_password_reset_tokens_hash', { unique: true })
  @Column({ name: 'token_hash', type: 'text' })
  tokenHash!: string;
  /** 'reset' for a forgotten password, 'invite' for a new user's first password. */
  @Column({ type: 'text', default: 'reset' }) purpose!: 'reset' | 'invite';
  @Column({ name: 'expires_at', type: 'timestamptz' }) expiresAt!: Date;
  @Column({ name: 'used_at', type: 'timestamptz', nullable: true }) usedAt!: Date | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
}
