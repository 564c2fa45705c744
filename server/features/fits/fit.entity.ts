import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { FitGeometry, FitHighKResult, FitModel, FitStatus, FitWindowInput, HighKOptions } from '@shared/schemas/fits';
import type { RecordEntity } from '../records/record.entity';
import type { User } from '../users/user.entity';

/** The stored outcome of one fit: the server's numbers, never the client's preview. */
export interface StoredFitResult {
  slopePerSecond: number;
  intercept: number;
  t0Seconds: number;
  rSquared: number;
  count: number;
  window: { source: 'recommended' | 'fallback' | 'entered' | 'all-readings'; fromSeconds: number; toSeconds: number; headMax: number; headMin: number; count: number };
  h0M: number;
  effectiveH0M: number;
  expectedH0M: number | null;
  lineCrossingSeconds: number;
  recordCrossingSeconds: number | null;
  kMetersPerSecond: number;
  kSimplifiedMetersPerSecond: number | null;
  casingRadiusUsedM: number;
  casingRadiusIsEffective: boolean;
  lineReference: string;
  kReference: string;
  /** A high-K fit's own numbers; absent on a straight-line fit. */
  highK?: FitHighKResult | null;
}

/**
 * One analysis of one record by one method over one window. A Checked fit is never changed:
 * editing it starts a new revision in the same chain.
 */
@Entity('fits')
@Index(['recordId'])
@Index(['wellId', 'status'])
@Index(['siteId', 'status'])
export class FitEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  siteId: string;

  @Column('varchar')
  wellId: string;

  @Column('varchar')
  recordId: string;

  @ManyToOne('RecordEntity', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'recordId' })
  record: Relation<RecordEntity>;

  /** The first revision's id, shared by every revision. */
  @Index()
  @Column('varchar')
  chainId: string;

  @Column('integer')
  revision: number;

  @Column('varchar', { length: 16 })
  status: FitStatus;

  @Column('datetime', { nullable: true })
  supersededAt: Date | null;

  @Column('varchar', { length: 16 })
  method: 'hvorslev' | 'bouwer-rice';

  /** 'line' (straight line of ln H/H0) or 'high-k' (the high-K variant of `method`). */
  @Column('varchar', { length: 16, default: 'line' })
  model: FitModel;

  @Column('varchar', { length: 16 })
  line: 'anchored' | 'free';

  @Column('simple-json', { nullable: true })
  windowInput: FitWindowInput | null;

  @Column('simple-json')
  geometry: FitGeometry;

  @Column('simple-json')
  options: { allowOscillation: boolean; material?: string; highK?: HighKOptions };

  @Column('text', { default: '' })
  note: string;

  @Column('simple-json')
  result: StoredFitResult;

  @Column('simple-json')
  flags: unknown[];

  /** The analyst's reasons for keeping the fit despite a flag that changes K, by flag code. */
  @Column('simple-json', { default: '{}' })
  flagReasons: Record<string, string>;

  /** Flags that changed K and were resolved by applying their suggested action. */
  @Column('simple-json', { default: '[]' })
  resolvedFlags: ResolvedFlag[];

  /** Copied out of `result` so Well K and the map can aggregate without parsing JSON. */
  @Column('real')
  kMetersPerSecond: number;

  @Column('varchar')
  preparedById: string;

  @ManyToOne('User', { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'preparedById' })
  preparedBy: Relation<User>;

  @Column('varchar', { nullable: true })
  checkedById: string | null;

  @ManyToOne('User', { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'checkedById' })
  checkedBy: Relation<User> | null;

  @Column('text', { nullable: true })
  checkComment: string | null;

  @Column('datetime', { nullable: true })
  submittedAt: Date | null;

  @Column('datetime', { nullable: true })
  checkedAt: Date | null;

  @Column('datetime')
  createdAt: Date;

  @Column('datetime')
  updatedAt: Date;
}

export interface ResolvedFlag {
  code: string;
  message: string;
  /** The action applied, as its button said. */
  action: string;
  byId: string;
  at: string;
}
