import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from 'typeorm';
import type { SiteRole } from '@shared/schemas/common';
import type { Site } from './site.entity';
import type { User } from '../users/user.entity';

@Entity('memberships')
export class Membership {
  @PrimaryColumn('varchar')
  siteId: string;

  @PrimaryColumn('varchar')
  userId: string;

  @Column('varchar', { length: 16 })
  role: SiteRole;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @ManyToOne('Site', (s: Site) => s.memberships, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'siteId' })
  site: Relation<Site>;

  @ManyToOne('User', (u: User) => u.memberships, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user: Relation<User>;
}
