import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** A message received by the local fake SMTP service (development and tests): what a relay accepted. */
@Entity('local_mailbox')
export class LocalMail {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar', { length: 400 })
  fromAddress: string;

  @Column('simple-json')
  toAddresses: string[];

  @Column('varchar', { length: 500 })
  subject: string;

  @Column('text')
  text: string;

  @Column('text', { nullable: true })
  html: string | null;

  // Set in code with milliseconds: the column default only has whole seconds.
  @Column('datetime', { default: () => "datetime('now')" })
  receivedAt: Date;
}
