import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { FitEvent } from '@shared/schemas/fits';
import type { User } from '../users/user.entity';
import type { FitEntity } from './fit.entity';

/** The audit trail of a fit: every state change and every parameter change, with who and when. */
@Entity('fit_events')
@Index(['fitId', 'at'])
export class FitEventEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  fitId: string;

  @ManyToOne('FitEntity', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'fitId' })
  fit: Relation<FitEntity>;

  @Column('varchar', { length: 24 })
  kind: FitEvent['kind'];

  @Column('varchar', { nullable: true })
  actorId: string | null;

  @ManyToOne('User', { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'actorId' })
  actor: Relation<User> | null;

  /** Milliseconds kept: several events can happen within a second. */
  @Column('datetime')
  at: Date;

  @Column('simple-json')
  details: Record<string, unknown>;
}
