import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, type Relation } from 'typeorm';
import type { AquiferCondition, IntakeRadius, WellStatus } from '@shared/schemas/wells';
import type { Site } from '../sites/site.entity';

/** A monitoring well. Every length is in metres; depths are below ground unless named otherwise. */
@Entity('wells')
@Index(['siteId', 'name'], { unique: true })
export class Well {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column('varchar')
  siteId: string;

  @ManyToOne('Site', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'siteId' })
  site: Relation<Site>;

  @Column('varchar', { length: 80 })
  name: string;

  /** The system the coordinates were entered in: the site's EPSG code, another one, or 4326 (lat/lon). */
  @Column('integer')
  inputEpsg: number;

  /** As entered: easting/x, or longitude when inputEpsg is 4326. */
  @Column('real')
  inputX: number;

  /** As entered: northing/y, or latitude when inputEpsg is 4326. */
  @Column('real')
  inputY: number;

  @Column('real')
  lon: number;

  @Column('real')
  lat: number;

  /** In the site's CRS, for maps and interpolation. */
  @Column('real')
  siteX: number;

  @Column('real')
  siteY: number;

  @Column('real')
  groundElevationM: number;

  /** Top of casing. */
  @Column('real')
  measuringPointElevationM: number;

  @Column('real')
  screenTopDepthM: number;

  @Column('real')
  screenBottomDepthM: number;

  @Column('real')
  screenTopElevationM: number;

  @Column('real')
  screenBottomElevationM: number;

  @Column('real')
  casingRadiusM: number;

  @Column('real')
  screenRadiusM: number;

  @Column('real')
  boreholeRadiusM: number;

  /** Hvorslev's intake R and Bouwer-Rice's rw: the screen's radius or the borehole's (decision 012). */
  @Column('varchar', { length: 16, default: 'screen' })
  intakeRadius: IntakeRadius;

  @Column('real', { nullable: true })
  filterPackPorosity: number | null;

  @Column('varchar', { length: 80, nullable: true })
  hydroUnit: string | null;

  @Column('varchar', { length: 16 })
  aquiferCondition: AquiferCondition;

  @Column('real', { nullable: true })
  saturatedThicknessM: number | null;

  /** Static water level, depth below the measuring point. */
  @Column('real', { nullable: true })
  staticWaterDepthM: number | null;

  /** Lw: static water level to screen bottom; derived from the static level when not given. */
  @Column('real', { nullable: true })
  staticToScreenBottomM: number | null;

  @Column('varchar', { length: 16 })
  status: WellStatus;

  @Column('text', { default: '' })
  notes: string;

  @Column('boolean', { default: false })
  isDemo: boolean;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'datetime' })
  updatedAt: Date;
}
