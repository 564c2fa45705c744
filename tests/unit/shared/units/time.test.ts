import { describe, expect, it } from 'vitest';
import { TIME_COLUMN_FORMATS, parseClockDuration, timeFromSi, timeSeriesToSi, timeToSi } from '@shared/units/time';
import { TIMESTAMP_LAYOUTS, createTimestampParser, parseTimestamp, zoneOffsetMs } from '@shared/units/timestamp';

const utc = (iso: string) => Date.parse(iso) / 1000;

describe('elapsed time units', () => {
  it('converts minutes, hours and days to seconds', () => {
    expect(timeToSi(2.8, 'min')).toBeCloseTo(168, 12);
    expect(timeToSi(1.5, 'h')).toBe(5400);
    expect(timeToSi(1, 'd')).toBe(86400);
    expect(timeFromSi(90, 'min')).toBe(1.5);
    expect(Array.from(timeSeriesToSi([0, 0.5, 1], 'min'))).toEqual([0, 30, 60]);
  });

  it('reads mm:ss and h:mm:ss durations', () => {
    expect(parseClockDuration('01:18.5')).toBe(78.5);
    expect(parseClockDuration('2:48')).toBe(168);
    expect(parseClockDuration('1:02:03')).toBe(3723);
    expect(parseClockDuration('0:00,25')).toBe(0.25);
  });

  it('refuses a clock reading with 60 or more seconds, naming the field', () => {
    expect(() => parseClockDuration('01:75', 'record.time')).toThrow('record.time: "01:75" has 75 seconds');
    expect(() => parseClockDuration('ten past')).toThrow('time: "ten past" is not a duration of the form mm:ss or h:mm:ss');
  });

  it('offers elapsed units, clock readings and timestamps as column formats', () => {
    expect(TIME_COLUMN_FORMATS.map((f) => f.id)).toEqual(['s', 'min', 'h', 'd', 'mm:ss', 'timestamp']);
  });
});

describe('timestamps', () => {
  it('reads ISO 8601 with an offset regardless of the chosen zone', () => {
    expect(parseTimestamp('2024-07-04T13:15:30+05:30', { layout: 'iso', timeZone: 'America/Chicago' })).toBe(utc('2024-07-04T07:45:30Z'));
    expect(parseTimestamp('2024-07-04T13:15:30.125Z', { layout: 'iso' })).toBe(utc('2024-07-04T13:15:30.125Z'));
  });

  it('reads a timestamp without an offset in the chosen IANA zone', () => {
    // Chicago is on CDT (UTC−5) in July
    expect(parseTimestamp('2024-07-04 13:15:30', { layout: 'iso', timeZone: 'America/Chicago' })).toBe(utc('2024-07-04T18:15:30Z'));
    expect(parseTimestamp('2024-01-04 13:15:30', { layout: 'iso', timeZone: 'America/Chicago' })).toBe(utc('2024-01-04T19:15:30Z'));
  });

  it('reads US logger timestamps with AM/PM and fractional seconds', () => {
    expect(parseTimestamp('07/04/2024 01:15:30.25 PM', { layout: 'mdy', timeZone: 'America/Chicago' })).toBe(utc('2024-07-04T18:15:30.250Z'));
    expect(parseTimestamp('7/4/2024 12:00:00 AM', { layout: 'mdy' })).toBe(utc('2024-07-04T00:00:00Z'));
  });

  it('reads day-first and year-first logger layouts', () => {
    expect(parseTimestamp('04.07.2024 13:15:30', { layout: 'dmy', timeZone: 'Asia/Kolkata' })).toBe(utc('2024-07-04T07:45:30Z'));
    expect(parseTimestamp('04/07/2024 13:15', { layout: 'dmy' })).toBe(utc('2024-07-04T13:15:00Z'));
    expect(parseTimestamp('2024/7/4 13:15:00', { layout: 'ymd' })).toBe(utc('2024-07-04T13:15:00Z'));
  });

  it('resolves a wall time repeated when clocks go back to its earlier instant', () => {
    expect(parseTimestamp('2024-11-03 01:30:00', { layout: 'iso', timeZone: 'America/New_York' })).toBe(utc('2024-11-03T05:30:00Z'));
    expect(parseTimestamp('2024-10-27 02:30:00', { layout: 'iso', timeZone: 'Europe/Berlin' })).toBe(utc('2024-10-27T00:30:00Z'));
  });

  it('reads a wall time skipped when clocks go forward with the offset in force before', () => {
    expect(parseTimestamp('2024-03-10 02:30:00', { layout: 'iso', timeZone: 'America/New_York' })).toBe(utc('2024-03-10T07:30:00Z'));
  });

  it('gives one second between consecutive logger rows across a day boundary', () => {
    const parse = createTimestampParser({ layout: 'iso', timeZone: 'Australia/Adelaide' });
    expect(parse('2024-07-04 23:59:59.5') - parse('2024-07-04 23:59:58.5')).toBe(1);
    expect(parse('2024-07-05 00:00:00') - parse('2024-07-04 23:59:59')).toBe(1);
  });

  it('knows the zone offset at an instant', () => {
    expect(zoneOffsetMs('Asia/Kolkata', Date.UTC(2024, 0, 1))).toBe(5.5 * 3600_000);
  });

  it('refuses an unknown time zone and a malformed timestamp by field', () => {
    expect(() => parseTimestamp('2024-07-04 13:15', { layout: 'iso', timeZone: 'Mars/Olympus' })).toThrow('timeZone: "Mars/Olympus" is not an IANA time zone');
    expect(() => parseTimestamp('2024-02-30 13:15', { layout: 'iso' })).toThrow('time: "2024-02-30 13:15" has day 30, not in that month');
    expect(() => parseTimestamp('13:15 4 July', { layout: 'iso' })).toThrow('does not match the timestamp layout iso');
  });

  it('lists the layouts it reads', () => {
    expect(TIMESTAMP_LAYOUTS.map((l) => l.id)).toEqual(['iso', 'ymd', 'mdy', 'dmy']);
  });
});
