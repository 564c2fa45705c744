import type { TimeColumnFormat } from '../units/time';
import type { TimestampLayout } from '../units/timestamp';
import type { Delimiter } from './tokenize';

/** Where the readings sit in a logger export. Line numbers count from 1. */
export interface FileLayout {
  delimiter: Delimiter;
  /** The column names' line, or null for a file without one. */
  headerLine: number | null;
  /** A line of units under the header, or null. */
  unitsLine: number | null;
  firstDataLine: number;
  /** Last line of readings when the logger writes a footer after them; null: to the end. */
  lastDataLine: number | null;
  /** Numbers written 12,345 instead of 12.345 (only with a semicolon, tab or space delimiter). */
  decimalComma: boolean;
}

/**
 * How the time of a reading is read. `columns` holds one column (elapsed time, or a full date and
 * time), or several that together make a timestamp (date, time of day, AM/PM), joined by a space.
 */
export interface TimeMapping {
  columns: number[];
  format: TimeColumnFormat;
  /** For format 'timestamp'. */
  timestampLayout?: TimestampLayout;
  /** IANA zone for timestamps without an offset; default UTC. */
  timeZone?: string;
}

export interface ColumnMapping {
  time: TimeMapping;
  /** Column index (0-based) of the measured value. */
  valueColumn: number;
}

export type ColumnKind = 'number' | 'timestamp' | 'date' | 'time' | 'meridiem' | 'text' | 'empty';

export interface ColumnInfo {
  index: number;
  name: string;
  /** Unit as written in the units line or the header ("m", "(psi)", "Level [ft]"); null if none. */
  unitText: string | null;
  kind: ColumnKind;
}
