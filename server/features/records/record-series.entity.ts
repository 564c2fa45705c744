import { Column, Entity, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from 'typeorm';
import type { RecordEntity } from './record.entity';

/**
 * The reduced series of a record as little-endian Float64 arrays, one BLOB each (a million
 * readings are 8 MB per array, written and read in milliseconds), not a row per reading.
 */
@Entity('record_series')
export class RecordSeries {
  @PrimaryColumn('varchar')
  recordId: string;

  @ManyToOne('RecordEntity', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'recordId' })
  record: Relation<RecordEntity>;

  @Column('integer')
  count: number;

  /** Seconds from the test start (negative before it). */
  @Column('blob')
  elapsedSeconds: Buffer;

  /** s = static − level, m. */
  @Column('blob')
  displacementM: Buffer;

  /** H/H0. */
  @Column('blob')
  normalizedHead: Buffer;
}
