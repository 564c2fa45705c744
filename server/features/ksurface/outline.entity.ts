import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, type Relation } from 'typeorm';
import type { OutlineGeometry } from '@shared/schemas/ksurface';
import type { Site } from '../sites/site.entity';

/** A named polygon of a site (a plume, a study area) that a K surface is clipped to. Geometry in WGS84. */
@Entity('outlines')
@Index('IDX_outlines_site', ['siteId', 'createdAt'])
export class OutlineEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  siteId: string;

  @ManyToOne('Site', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'siteId' })
  site: Relation<Site>;

  @Column('varchar', { length: 120 })
  name: string;

  @Column('simple-json')
  geometry: OutlineGeometry;

  /** Geodesic area, m². */
  @Column('real')
  areaM2: number;

  @Column('varchar')
  createdById: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'datetime' })
  updatedAt: Date;
}
