import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { CaptureSketch } from '@shared/schemas/ksurface';
import type { Site } from '../sites/site.entity';

/** A trial extraction well with its inputs and the server's screening numbers (computed once, at creation). */
@Entity('capture_sketches')
@Index('IDX_capture_sketches_site', ['siteId', 'createdAt'])
export class CaptureSketchEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  siteId: string;

  @ManyToOne('Site', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'siteId' })
  site: Relation<Site>;

  @Column('varchar', { length: 120 })
  name: string;

  /** In the site's coordinate system. */
  @Column('real')
  x: number;

  @Column('real')
  y: number;

  @Column('real')
  lon: number;

  @Column('real')
  lat: number;

  @Column('simple-json')
  inputs: CaptureSketch['inputs'];

  @Column('simple-json')
  results: CaptureSketch['results'];

  @Column('varchar')
  createdById: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
