import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { ViewerLayers } from '@shared/schemas/viewer-links';
import type { Site } from '../sites/site.entity';

/** A read-only, revocable, expiring link to a site's K map. Only the token's SHA-256 is kept. */
@Entity('viewer_links')
@Index('IDX_viewer_links_site', ['siteId', 'createdAt'])
export class ViewerLinkEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  siteId: string;

  @ManyToOne('Site', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'siteId' })
  site: Relation<Site>;

  /** hex SHA-256 of the token (server/auth/tokens.ts hashToken). */
  @Index('IDX_viewer_links_token_hash', { unique: true })
  @Column('varchar', { length: 64 })
  tokenHash: string;

  @Column('varchar', { length: 120 })
  label: string;

  @Column('simple-json')
  layers: ViewerLayers;

  @Column('boolean')
  showNames: boolean;

  @Column('boolean')
  showConstruction: boolean;

  @Column('varchar')
  createdById: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @Column('datetime')
  expiresAt: Date;

  @Column('datetime', { nullable: true })
  revokedAt: Date | null;

  @Column('datetime', { nullable: true })
  lastViewedAt: Date | null;

  @Column('integer', { default: 0 })
  viewCount: number;
}
