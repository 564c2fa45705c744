import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { BasemapMetadata } from '@shared/schemas/basemaps';

/**
 * An uploaded MBTiles basemap. The file lives in BASEMAP_DIR as `fileName`; the metadata read
 * from it when it was checked is kept here. The built-in basemap (tiles/dist) has no row.
 */
@Entity('basemaps')
export class Basemap {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { length: 120 })
  name: string;

  @Column('varchar', { length: 200 })
  fileName: string;

  @Column('integer')
  sizeBytes: number;

  @Column('simple-json')
  metadata: BasemapMetadata;

  /** Used by every site that has not chosen a basemap; at most one row is the default. */
  @Column('boolean', { default: false })
  isDefault: boolean;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
