import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { ReferenceMode } from '@shared/hydraulics/reduction';
import type { RecordSource, RecordTestType } from '@shared/schemas/records';
import type { Site } from '../sites/site.entity';
import type { User } from '../users/user.entity';
import type { Well } from '../wells/well.entity';

/**
 * One recovery test. The raw file(s) live in record_files and the reduced series in
 * record_series, so listing records never reads a BLOB. Lengths in metres, times in seconds.
 * (The class is not called Record: that would shadow TypeScript's Record<K, V>.)
 */
@Entity('records')
@Index(['wellId'])
export class RecordEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  siteId: string;

  @ManyToOne('Site', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'siteId' })
  site: Relation<Site>;

  @Column('varchar')
  wellId: string;

  @ManyToOne('Well', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'wellId' })
  well: Relation<Well>;

  @Column('varchar', { length: 16 })
  testType: RecordTestType;

  @Column('varchar', { length: 8 })
  source: RecordSource;

  @Column('varchar', { length: 16 })
  reference: ReferenceMode;

  /** The settings as entered (mapping, units, time zone, static level, test start, density, slug volume). */
  @Column('simple-json')
  settings: Record<string, unknown>;

  /** YYYY-MM-DD, as entered or read from the timestamps. */
  @Column('varchar', { length: 10, nullable: true })
  testDate: string | null;

  /** 'epoch': times are seconds since 1970 (timestamps); 'elapsed': seconds on the logger's own count. */
  @Column('varchar', { length: 8 })
  clock: 'epoch' | 'elapsed';

  /** First reading on the record's clock. */
  @Column('real')
  firstReadingSeconds: number;

  /** Test start on the record's clock. */
  @Column('real')
  testStartSeconds: number;

  @Column('integer')
  testStartIndex: number;

  @Column('varchar', { length: 8 })
  testStartSource: 'entered' | 'detected';

  @Column('real')
  durationSeconds: number;

  @Column('varchar', { length: 200, default: '' })
  fieldCrew: string;

  @Column('text', { default: '' })
  notes: string;

  @Column('integer')
  sampleCount: number;

  @Column('real')
  h0M: number;

  /** The static level used, in the reference's terms (depth below the measuring point, or head above the sensor). */
  @Column('real')
  staticLevelM: number;

  @Column('varchar', { length: 8 })
  staticSource: 'entered' | 'pre-test';

  @Column('integer')
  preTestCount: number;

  @Column('varchar', { length: 16 })
  direction: 'rising-head' | 'falling-head';

  /** Slug volume in m³, when given, for the expected H0. */
  @Column('real', { nullable: true })
  slugVolumeM3: number | null;

  @Column('varchar', { nullable: true })
  createdById: string | null;

  @ManyToOne('User', { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'createdById' })
  createdBy: Relation<User> | null;

  @Column('boolean', { default: false })
  isDemo: boolean;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
