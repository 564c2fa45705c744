import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * Every request that may send mail to an address (a password reset, an invitation), whether or not
 * a message went out: the limits per target address, per account and per client address count
 * these rows, so they hold across restarts and do not reveal which addresses have accounts.
 */
@Entity('mail_requests')
@Index('IDX_mail_requests_target', ['kind', 'targetKey', 'createdAt'])
@Index('IDX_mail_requests_client', ['kind', 'clientAddress', 'createdAt'])
@Index('IDX_mail_requests_account', ['kind', 'requestedById', 'createdAt'])
export class MailRequest {
  @PrimaryGeneratedColumn('increment')
  id: number;

  @Column('varchar', { length: 40 })
  kind: 'password-reset' | 'invitation' | 'viewer-link';

  /** The target address, trimmed and lower-cased. */
  @Column('varchar', { length: 320 })
  targetKey: string;

  @Column('varchar', { nullable: true })
  requestedById: string | null;

  @Column('varchar', { length: 64, nullable: true })
  clientAddress: string | null;

  /** Whether a message was queued for this request (false: an unknown address, or within a limit). */
  @Column('boolean')
  mailed: boolean;

  @Column('datetime')
  createdAt: Date;
}
