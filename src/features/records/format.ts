import { RECORD_TEST_TYPE_LABELS, type RecordDto } from '@shared/schemas/records';
import type { DisplayUnits } from '@shared/schemas/sites';
import { lengthFromSi, type LengthUnit } from '@shared/units/length';
import { formatDate } from '@/lib/format';

export const REFERENCE_LABELS: Record<RecordDto['reference'], string> = {
  depth: 'Depth to water below the measuring point',
  vented: 'Head above a vented sensor',
  absolute: 'Absolute pressure, with a barometric record',
};

export const DIRECTION_LABELS: Record<RecordDto['direction'], string> = {
  'rising-head': 'Rising-head (water below static at the start)',
  'falling-head': 'Falling-head (water above static at the start)',
};

/** "Bail-down test (rising-head), 14 May 2025": how a record is named in lists and headings. */
export function recordTitle(record: Pick<RecordDto, 'testType' | 'testDate'>): string {
  const type = RECORD_TEST_TYPE_LABELS[record.testType];
  return record.testDate ? `${type}, ${formatDate(record.testDate)}` : type;
}

/** The site's length unit for water levels and H0. */
export const levelUnitFor = (units: DisplayUnits): LengthUnit => (units === 'US' ? 'ft' : 'm');

export function formatLevel(valueM: number | null, units: DisplayUnits | LengthUnit, decimals?: number): string {
  if (valueM === null) return '—';
  const unit: LengthUnit = units === 'SI' ? 'm' : units === 'US' ? 'ft' : units;
  const d = decimals ?? (unit === 'm' || unit === 'ft' ? 3 : 1);
  return `${lengthFromSi(valueM, unit).toFixed(d)} ${unit}`;
}

/** A duration in the largest unit that keeps it readable: 45 s, 12.5 min, 5.6 h, 2.1 d. */
export function formatDuration(seconds: number): string {
  const s = Math.abs(seconds);
  if (s < 120) return `${Number(seconds.toPrecision(3))} s`;
  if (s < 7200) return `${Number((seconds / 60).toPrecision(3))} min`;
  if (s < 172800) return `${Number((seconds / 3600).toPrecision(3))} h`;
  return `${Number((seconds / 86400).toPrecision(3))} d`;
}

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`;
  return `${(bytes / 1024 / 1024).toFixed(1)} MB`;
}

export function formatCount(n: number): string {
  return n.toLocaleString('en-US');
}
