import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** Every message the product sends, as handed to the mail provider (the SMTP fake locally). */
@Entity({ name: 'outbox_messages' })
@Index('ix_outbox_messages_farm_created', ['farmId', 'createdAt'])
export class OutboxMessage {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ name: 'farm_id', type: 'uuid', nullable: true }) farmId!: string | null;
  @Column({ type: 'text' }) kind!: 'alert' | 'escalation' | 'digest' | 'invitation' | 'password_reset';
  @Column({ name: 'to_address', type: 'text' }) toAddress!: string;
  @Column({ type: 'text' }) subject!: string;
  @Column({ type: 'text' }) body!: string;
  @Column({ type: 'text', default: 'queued' }) status!: 'queued' | 'sent' | 'failed';
  @Column({ name: 'provider_message_id', type: 'text', nullable: true }) providerMessageId!: string | null;
  @Column({ type: 'text', nullable: true }) error!: string | null;
  @Column({ name: 'related_id', type: 'text', nullable: true }) relatedId!: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
  @Column({ name: 'sent_at', type: 'timestamptz', nullable: true }) sentAt!: Date | null;
}
