import { Column, Entity, PrimaryColumn } from 'typeorm';

/**
 * A counter per site that SQLite triggers bump on every write to its wells or fits (migration
 * MapVersions1764620000000), whatever code path made it, so the K map's wells layer can be cached
 * and answered with an ETag.
 */
@Entity('map_versions')
export class MapVersion {
  @PrimaryColumn('varchar')
  siteId: string;

  @Column('integer', { default: 0 })
  version: number;
}
