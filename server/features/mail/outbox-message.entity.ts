import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import type { MailKind, MailStatus } from '@shared/schemas/users';

/**
 * The transactional outbox: a message is written in the same transaction as the change it tells
 * of, and the mail worker delivers it after the commit (decision 011). Nothing waits on the relay.
 */
@Entity('mail_outbox')
@Index('IDX_mail_outbox_due', ['status', 'nextAttemptAt'])
export class OutboxMessage {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar', { length: 40 })
  kind: MailKind;

  @Column('simple-json')
  toAddresses: string[];

  @Column('varchar', { length: 500 })
  subject: string;

  @Column('text')
  text: string;

  @Column('text', { nullable: true })
  html: string | null;

  /** pending → sending → sent; back to pending after a failed attempt; failed after the last one. */
  @Column('varchar', { length: 10, default: 'pending' })
  status: MailStatus;

  @Column('integer', { default: 0 })
  attempts: number;

  @Column('datetime')
  nextAttemptAt: Date;

  @Column('text', { nullable: true })
  lastError: string | null;

  @Column('datetime')
  createdAt: Date;

  @Column('datetime', { nullable: true })
  sentAt: Date | null;
}
