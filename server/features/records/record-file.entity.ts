import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { RecordEntity } from './record.entity';

/** An uploaded file, kept byte for byte: the logger export (raw) or its barometric record. */
@Entity('record_files')
@Index(['recordId', 'role'], { unique: true })
export class RecordFile {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  recordId: string;

  @ManyToOne('RecordEntity', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'recordId' })
  record: Relation<RecordEntity>;

  @Column('varchar', { length: 16 })
  role: 'raw' | 'barometric';

  @Column('varchar', { length: 255 })
  name: string;

  @Column('varchar', { length: 120 })
  mediaType: string;

  @Column('integer')
  sizeBytes: number;

  /** Lower-case hex. */
  @Column('varchar', { length: 64 })
  sha256: string;

  @Column('blob')
  content: Buffer;
}
