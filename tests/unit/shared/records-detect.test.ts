import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { describeLayout, detectLayout } from '@shared/records/detect';
import { decodeRecordFile } from '@shared/records/text';

const fixture = (name: string) => decodeRecordFile(fs.readFileSync(path.resolve(__dirname, '../../fixtures/loggers', name))).text;

describe('layout detection of logger exports', () => {
  it('finds a comma file with a preamble, a header and a units line, and a UTC offset named in the preamble', () => {
    const d = detectLayout(fixture('vented-comma.csv'));
    expect(d.layout).toEqual({ delimiter: 'comma', headerLine: 7, unitsLine: 8, firstDataLine: 9, lastDataLine: null, decimalComma: false });
    expect(d.preamble[1]).toBe('Instrument,Fictional level sensor LS-10');
    expect(d.columns.map((c) => [c.name, c.unitText, c.kind])).toEqual([
      ['Timestamp', null, 'timestamp'],
      ['Seconds', 's', 'number'],
      ['Level', 'm', 'number'],
      ['Temperature', 'degC', 'number'],
    ]);
    expect(d.mapping).toEqual({ time: { columns: [0], format: 'timestamp', timestampLayout: 'iso' }, valueColumn: 2 });
    expect(d.valueUnit).toBe('m');
    expect(d.reference).toBe('vented');
    // UTC+01:00 is the fixed zone Etc/GMT-1 (IANA's Etc zones count the other way round).
    expect(d.timeZone).toBe('Etc/GMT-1');
  });

  it('finds a semicolon file with decimal commas and DD.MM.YYYY timestamps, and takes mbar of ~1300 for absolute pressure', () => {
    const d = detectLayout(fixture('absolute-semicolon.csv'));
    expect(d.layout).toEqual({ delimiter: 'semicolon', headerLine: 6, unitsLine: null, firstDataLine: 7, lastDataLine: null, decimalComma: true });
    expect(d.mapping).toEqual({ time: { columns: [0], format: 'timestamp', timestampLayout: 'dmy' }, valueColumn: 1 });
    expect(d.columns[1]).toMatchObject({ name: 'Pressure (mbar)', unitText: 'mbar', unit: { quantity: 'pressure', id: 'mbar' } });
    expect(d.reference).toBe('absolute');
    expect(d.notes.join(' ')).toMatch(/absolute pressure/);
  });

  it('finds a tab file with units in brackets on their own line and MM/DD/YYYY hh:mm:ss AM/PM timestamps', () => {
    const d = detectLayout(fixture('baro-tab.txt'), { role: 'barometric' });
    expect(d.layout).toMatchObject({ delimiter: 'tab', headerLine: 3, unitsLine: 4, firstDataLine: 5 });
    expect(d.mapping?.time).toEqual({ columns: [0], format: 'timestamp', timestampLayout: 'mdy' });
    expect(d.valueUnit).toBe('kPa');
    // No day above 12 and AM/PM present: read as month/day/year, with a note saying so.
    expect(d.notes.some((n) => /month\/day\/year/.test(n))).toBe(true);
    expect(d.notes.some((n) => /needs a barometric file/.test(n))).toBe(false);
  });

  it('finds aligned columns separated by spaces, skips a rule line under the header, and reads elapsed minutes and depth in feet', () => {
    const d = detectLayout(fixture('whitespace-elapsed.txt'));
    expect(d.layout).toEqual({ delimiter: 'whitespace', headerLine: 4, unitsLine: null, firstDataLine: 6, lastDataLine: null, decimalComma: false });
    expect(d.mapping).toEqual({ time: { columns: [0], format: 'min' }, valueColumn: 1 });
    expect(d.valueUnit).toBe('ft');
    expect(d.reference).toBe('depth');
  });

  it('joins separate date and time columns into one timestamp and stops before a footer', () => {
    const d = detectLayout(fixture('date-time-columns.csv'));
    expect(d.layout).toMatchObject({ headerLine: 1, firstDataLine: 2, lastDataLine: 31 });
    expect(d.mapping).toEqual({ time: { columns: [0, 1], format: 'timestamp', timestampLayout: 'iso' }, valueColumn: 2 });
    expect(d.columns.map((c) => c.kind)).toEqual(['date', 'time', 'number', 'number']);
  });

  it('reads quoted ISO 8601 timestamps with offsets and an IANA zone named in the preamble', () => {
    const d = detectLayout(fixture('iso-offset.csv'));
    expect(d.layout).toMatchObject({ delimiter: 'comma', headerLine: 3, firstDataLine: 4 });
    expect(d.timeZone).toBe('Europe/Berlin');
    expect(d.reference).toBe('absolute');
    expect(d.notes.some((n) => /carry their own UTC offset/.test(n))).toBe(true);
  });

  it('tells DD/MM from MM/DD by a day above 12', () => {
    const rows = (first: string) => ['Time,Level (m)', `${first} 10:00:00,1.0`, `${first} 10:00:01,0.9`, `${first} 10:00:02,0.8`].join('\n');
    expect(detectLayout(rows('25/06/2024')).mapping?.time.timestampLayout).toBe('dmy');
    expect(detectLayout(rows('06/25/2024')).mapping?.time.timestampLayout).toBe('mdy');
  });

  it('takes a file without a header, naming its columns by number', () => {
    const d = detectLayout(['0,1.20', '1,1.10', '2,1.05', '3,1.02'].join('\n'));
    expect(d.layout.headerLine).toBeNull();
    expect(d.columns.map((c) => c.name)).toEqual(['Column 1', 'Column 2']);
    expect(d.mapping?.time.columns).toEqual([0]);
  });

  it('says so when no lines of readings are found', () => {
    const d = detectLayout('just some words\nand more words\n');
    expect(d.mapping).toBeNull();
    expect(d.notes[0]).toMatch(/No lines of readings/);
  });

  it('describes the columns again for a layout the user changed', () => {
    const text = fixture('absolute-semicolon.csv');
    const detected = detectLayout(text);
    const asDots = describeLayout(text, { ...detected.layout, decimalComma: false });
    // With a decimal point expected, "1306,70" is not a number.
    expect(asDots.columns[1].kind).toBe('text');
    expect(asDots.mapping).toBeNull();
  });
});
