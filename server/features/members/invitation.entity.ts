import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { SiteRole } from '@shared/schemas/common';
import type { Site } from '../sites/site.entity';
import type { User } from '../users/user.entity';

@Entity('invitations')
export class Invitation {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  siteId: string;

  @ManyToOne('Site', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'siteId' })
  site: Relation<Site>;

  @Column('varchar', { length: 254 })
  email: string;

  @Column('varchar', { length: 16 })
  role: SiteRole;

  /** SHA-256 of the token; the token itself is only ever in the e-mail. */
  @Index({ unique: true })
  @Column('varchar', { length: 64 })
  tokenHash: string;

  @Column('varchar')
  invitedById: string;

  @ManyToOne('User', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'invitedById' })
  invitedBy: Relation<User>;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @Column('datetime')
  expiresAt: Date;

  @Column('datetime', { nullable: true })
  usedAt: Date | null;

  @Column('datetime', { nullable: true })
  revokedAt: Date | null;
}
