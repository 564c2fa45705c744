import { Column, CreateDateColumn, Entity, Index, PrimaryColumn } from 'typeorm';

/** Rows of the express-session store. */
@Entity('sessions')
export class SessionRow {
  @PrimaryColumn('varchar', { length: 128 })
  sid: string;

  @Column('text')
  data: string;

  @Index()
  @Column('integer')
  expiresAtMs: number;

  @Index()
  @Column('varchar', { nullable: true })
  userId: string | null;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
