import { Column, CreateDateColumn, Entity, Index, OneToMany, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { Membership } from '../sites/membership.entity';

@Entity('users')
export class User {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Index({ unique: true })
  @Column('varchar', { length: 254 })
  email: string;

  @Column('varchar', { length: 120 })
  name: string;

  @Column('varchar', { length: 100 })
  passwordHash: string;

  @Column('boolean', { default: false })
  isAdmin: boolean;

  @Column('boolean', { default: false })
  disabled: boolean;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @Column('datetime', { nullable: true })
  lastSignInAt: Date | null;

  @OneToMany('Membership', (m: Membership) => m.user)
  memberships: Relation<Membership[]>;
}
