import { Column, CreateDateColumn, Entity, OneToMany, PrimaryGeneratedColumn, UpdateDateColumn, type Relation } from 'typeorm';
import type { Membership } from './membership.entity';

@Entity('sites')
export class Site {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar', { length: 120 })
  name: string;

  @Column('text', { default: '' })
  description: string;

  @Column('integer')
  epsgCode: number;

  @Column('varchar', { length: 200 })
  crsName: string;

  @Column('varchar', { length: 8 })
  displayUnits: 'SI' | 'US';

  @Column('simple-json')
  hydroUnits: string[];

  @Column('boolean', { default: false })
  isDemo: boolean;

  /** The chosen basemap: "default" (built-in), an uploaded basemap's id, or null for the instance default. */
  @Column('varchar', { length: 64, nullable: true })
  basemapId: string | null;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'datetime' })
  updatedAt: Date;

  @OneToMany('Membership', (m: Membership) => m.site)
  memberships: Relation<Membership[]>;
}
