import fs from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { inferSchema, initParser } from 'udsv';
import { describe, expect, it } from 'vitest';
import { detectLayout } from '@shared/records/detect';
import { RecordFileError } from '@shared/records/errors';
import { parseDecimalText } from '@shared/records/number';
import { parseSeries, parseSeriesFromBytes, previewRows } from '@shared/records/parse';
import { decodeRecordFile } from '@shared/records/text';
import { TimestampReader } from '@shared/records/timestamp-reader';
import { createFieldBounds, splitFields } from '@shared/records/tokenize';
import type { ColumnMapping, FileLayout } from '@shared/records/types';
import { createTimestampParser, type TimestampLayout } from '@shared/units/timestamp';

const fixtureBytes = (name: string) => fs.readFileSync(path.resolve(__dirname, '../../fixtures/loggers', name));
const fixture = (name: string) => decodeRecordFile(fixtureBytes(name)).text;

function caught(run: () => unknown): RecordFileError {
  try {
    run();
  } catch (e) {
    if (e instanceof RecordFileError) return e;
    throw e;
  }
  throw new Error('expected a RecordFileError');
}

const ELAPSED_LAYOUT: FileLayout = { delimiter: 'comma', headerLine: 1, unitsLine: null, firstDataLine: 2, lastDataLine: null, decimalComma: false };
const ELAPSED_MAPPING: ColumnMapping = { time: { columns: [0], format: 's' }, valueColumn: 1 };
const elapsed = (rows: string[]) => ['t (s),level (m)', ...rows].join('\n');

describe('reading logger exports into time and value arrays', () => {
  it('reads timestamps in the chosen time zone: 10:02 at UTC+01:00 is 09:02Z', () => {
    const text = fixture('vented-comma.csv');
    const d = detectLayout(text);
    const s = parseSeries(text, d.layout, { ...d.mapping!, time: { ...d.mapping!.time, timeZone: d.timeZone! } });
    expect(s.timeSeconds.length).toBe(60);
    expect(s.timeSeconds[0]).toBe(Date.UTC(2024, 4, 14, 9, 2, 0) / 1000);
    expect(s.timeSeconds[59] - s.timeSeconds[0]).toBe(59);
    expect(s.clock).toBe('epoch');
    expect([s.firstLine, s.lastLine]).toEqual([9, 68]);
  });

  it('reads separate date and time columns in a zone with daylight saving (America/Chicago in July is UTC−5)', () => {
    const text = fixture('date-time-columns.csv');
    const d = detectLayout(text);
    const s = parseSeries(text, d.layout, { ...d.mapping!, time: { ...d.mapping!.time, timeZone: 'America/Chicago' } });
    expect(s.timeSeconds[0]).toBe(Date.UTC(2024, 6, 1, 14, 0, 0) / 1000);
    expect(s.timeSeconds.length).toBe(30);
    expect(s.value[0]).toBe(6.5);
  });

  it('keeps the offsets written in ISO 8601 timestamps, also where the zone would change its clocks', () => {
    const text = fixture('iso-offset.csv');
    const d = detectLayout(text);
    // Europe/Berlin moves to summer time at 02:00 on 2024-03-31; the logger kept writing +01:00.
    const s = parseSeries(text, d.layout, { ...d.mapping!, time: { ...d.mapping!.time, timeZone: 'Europe/Berlin' } });
    for (let i = 0; i < s.timeSeconds.length; i++) expect(s.timeSeconds[i]).toBe(Date.UTC(2024, 2, 31, 0, 59, 50) / 1000 + 0.5 * i);
  });

  it('reads decimal commas exactly as the same numbers written with a point', () => {
    const text = fixture('absolute-semicolon.csv');
    const d = detectLayout(text);
    const s = parseSeries(text, d.layout, { ...d.mapping!, time: { ...d.mapping!.time, timeZone: 'UTC' } });
    const written = previewRows(text, d.layout, 80).map((r) => Number(r.fields[1].replace(',', '.')));
    expect(Array.from(s.value)).toEqual(written);
    expect(s.timeSeconds[1] - s.timeSeconds[0]).toBe(2);
  });

  it('reads elapsed minutes into seconds', () => {
    const text = fixture('whitespace-elapsed.txt');
    const d = detectLayout(text);
    const s = parseSeries(text, d.layout, d.mapping!);
    expect(s.timeSeconds[1]).toBeCloseTo(3, 12);
    expect(s.clock).toBe('elapsed');
  });

  it('reports every malformed line by its number: wrong field count, not a number, time going backwards, empty value', () => {
    const text = fixture('malformed.csv');
    const e = caught(() => parseSeries(text, detectLayout(text).layout, ELAPSED_MAPPING, { field: 'file', what: 'The logger file' }));
    expect(e.field).toBe('file');
    expect(e.issues).toEqual([
      { line: 6, message: 'expected 2 fields, found 3' },
      { line: 8, message: '"n/a" in column "Level (m)" is not a number' },
      { line: 10, message: 'time 5.5 goes backwards from 6 on line 9' },
      { line: 12, message: 'column "Level (m)" is empty' },
    ]);
    expect(e.problem).toBe(
      'The logger file has 4 problems — line 6: expected 2 fields, found 3; line 8: "n/a" in column "Level (m)" is not a number; line 10: time 5.5 goes backwards from 6 on line 9; and 1 more',
    );
  });

  it('reports a repeated time, an unclosed quote, a time that is not a number and too few fields', () => {
    const e = caught(() => parseSeries(elapsed(['0,1.0', '1,0.9', '1,0.8', '"2,0.7', 'x,0.6', '5']), ELAPSED_LAYOUT, ELAPSED_MAPPING));
    expect(e.issues).toEqual([
      { line: 4, message: 'time 1 repeats the time on line 3; times must increase' },
      { line: 5, message: 'a quoted field does not close' },
      { line: 6, message: 'time "x" is not a number' },
      { line: 7, message: 'expected 2 fields, found 1' },
    ]);
  });

  it('reports a timestamp that does not match the chosen layout, with its line', () => {
    const text = ['Time,Level', '2024-05-01 10:00:00,1.0', '2024-05-01 10:00:01,0.9', '01.05.2024 10:00:02,0.8'].join('\n');
    const layout: FileLayout = { ...ELAPSED_LAYOUT };
    const e = caught(() => parseSeries(text, layout, { time: { columns: [0], format: 'timestamp', timestampLayout: 'iso', timeZone: 'UTC' }, valueColumn: 1 }));
    expect(e.issues).toEqual([{ line: 4, message: 'time "01.05.2024 10:00:02" does not match the timestamp layout iso' }]);
  });

  it('stops after 20 issues and says there are more', () => {
    const rows = Array.from({ length: 50 }, (_, i) => `${i},bad`);
    const e = caught(() => parseSeries(elapsed(rows), ELAPSED_LAYOUT, ELAPSED_MAPPING));
    expect(e.issues).toHaveLength(20);
    expect(e.truncated).toBe(true);
    expect(e.problem).toMatch(/has at least 20 problems .* and more$/);
  });

  it('refuses a mapping that points at a missing column, naming the columns there are', () => {
    expect(() => parseSeries(elapsed(['0,1', '1,2']), ELAPSED_LAYOUT, { ...ELAPSED_MAPPING, valueColumn: 3 }, { mappingField: 'settings.mapping' })).toThrow(
      'settings.mapping.valueColumn: column 3 does not exist; the file has 2 columns: 0 "t (s)", 1 "level (m)"',
    );
  });

  it('skips blank lines, allows a trailing delimiter and leaves out the cut last line of a sampled file', () => {
    const s = parseSeries(elapsed(['0,1.0,', '', '1,0.9,', '2,0.8,', '3,0.']), ELAPSED_LAYOUT, ELAPSED_MAPPING, { sampled: true });
    expect(Array.from(s.timeSeconds)).toEqual([0, 1, 2]);
  });

  it('refuses an empty file, a blank one and a binary one', () => {
    expect(() => decodeRecordFile(new Uint8Array())).toThrow('file: is empty (0 bytes)');
    expect(() => decodeRecordFile(new TextEncoder().encode('\n \n'))).toThrow('file: holds no readings (only blank lines)');
    expect(() => decodeRecordFile(Uint8Array.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0]))).toThrow(/not a text file/);
  });

  it('decodes UTF-16 with a byte-order mark and a Windows degree sign', () => {
    const utf16 = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('t,level\n0,1\n', 'utf16le')]);
    expect(decodeRecordFile(utf16)).toEqual({ text: 't,level\n0,1\n', encoding: 'utf-16le' });
    expect(decodeRecordFile(Uint8Array.from([0x54, 0x20, 0xb0, 0x43]))).toEqual({ text: 'T °C', encoding: 'windows-1252' });
  });
});

describe('the one-pass reader against uDSV (the project’s CSV parser) as reference', () => {
  /** The same columns read by uDSV: its string tuples, then Number() or the shared timestamp parser. */
  function viaUdsv(text: string, layout: FileLayout, mapping: ColumnMapping) {
    let p = 0;
    for (let i = 1; i < layout.firstDataLine; i++) p = text.indexOf('\n', p) + 1;
    const data = text.slice(p);
    const col = { comma: ',', semicolon: ';', tab: '\t', whitespace: ' ' }[layout.delimiter];
    const rows = (initParser(inferSchema(data, { col, header: () => [], trim: true })).stringArrs(data) as string[][]).filter((r) => r.some((f) => f !== ''));
    const parseTime =
      mapping.time.format === 'timestamp'
        ? createTimestampParser({ layout: mapping.time.timestampLayout!, timeZone: mapping.time.timeZone ?? 'UTC' })
        : (s: string) => Number(s) * (mapping.time.format === 'min' ? 60 : 1);
    return {
      time: rows.map((r) => parseTime(mapping.time.columns.map((c) => r[c]).join(' '))),
      value: rows.map((r) => Number(layout.decimalComma ? r[mapping.valueColumn].replace(',', '.') : r[mapping.valueColumn])),
    };
  }

  it.each(['vented-comma.csv', 'absolute-semicolon.csv', 'baro-tab.txt', 'iso-offset.csv', 'date-time-columns.csv'])('gives the same numbers as uDSV for %s', (name) => {
    let text = fixture(name);
    const d = detectLayout(text);
    if (d.layout.lastDataLine !== null) text = text.split('\n').slice(0, d.layout.lastDataLine).join('\n');
    const mapping = { ...d.mapping!, time: { ...d.mapping!.time, timeZone: 'Europe/Berlin' } };
    const ours = parseSeries(text, d.layout, mapping);
    const ref = viaUdsv(text, d.layout, mapping);
    expect(Array.from(ours.timeSeconds)).toEqual(ref.time);
    expect(Array.from(ours.value)).toEqual(ref.value);
  });

  it('gives the same numbers as uDSV for a generated 100 000-row export with fractional-second timestamps', () => {
    const lines = ['Invented generated export', 'Time,Elapsed,Level,Temp', ',s,m,C'];
    const t0 = Date.UTC(2025, 9, 26, 0, 30, 0);
    for (let i = 0; i < 100_000; i++) {
      const d = new Date(t0 + i * 100);
      const ts = `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 21)}`;
      lines.push(`${ts},${(i / 10).toFixed(1)},${(12 + Math.sin(i / 977) * 0.8).toFixed(5)},8.${i % 10}`);
    }
    const text = lines.join('\n');
    const d = detectLayout(text);
    const mapping = { ...d.mapping!, time: { ...d.mapping!.time, timeZone: 'UTC' } };
    const ours = parseSeries(text, d.layout, mapping);
    const ref = viaUdsv(text, d.layout, mapping);
    expect(ours.timeSeconds.length).toBe(100_000);
    expect(Array.from(ours.timeSeconds)).toEqual(ref.time);
    expect(Array.from(ours.value)).toEqual(ref.value);
  });
});

describe('the fast number and timestamp paths', () => {
  it('read any double written by JavaScript exactly as Number() does, with a point or a comma', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const s = String(x);
        expect(Object.is(parseDecimalText(s), Number(s))).toBe(true);
        expect(Object.is(parseDecimalText(s.replace('.', ','), true), Number(s))).toBe(true);
      }),
      { numRuns: 3000 },
    );
    fc.assert(
      fc.property(fc.integer({ min: -99999999, max: 99999999 }), fc.integer({ min: 0, max: 7 }), (m, k) => {
        const s = (m / 10 ** k).toFixed(k);
        expect(parseDecimalText(s)).toBe(Number(s));
      }),
    );
  });

  it('refuse what is not a plain decimal number', () => {
    for (const s of ['', ' ', '-', '.', 'NaN', 'Infinity', '1.2.3', '1,5', '0x10', '1e', '12a', '--1']) expect(parseDecimalText(s)).toBeNaN();
    expect(parseDecimalText(' 12.5 ')).toBe(12.5);
    expect(parseDecimalText('1,5', true)).toBe(1.5);
  });

  it('read a day of wall-clock times across a change of clocks line by line to the same instants as the shared parser', () => {
    // Europe/Berlin springs forward at 02:00 on 2024-03-31 and falls back at 03:00 on 2024-10-27;
    // America/New_York falls back at 02:00 on 2024-11-03. Every 37 s of wall time for 26 hours.
    for (const [zone, day] of [['Europe/Berlin', Date.UTC(2024, 2, 30, 23)], ['Europe/Berlin', Date.UTC(2024, 9, 26, 23)], ['America/New_York', Date.UTC(2024, 10, 2, 23)]] as const) {
      const lines: string[] = [];
      for (let ms = day; ms < day + 26 * 3600_000; ms += 37_000 + 100) lines.push(`${new Date(ms).toISOString().slice(0, 10)} ${new Date(ms).toISOString().slice(11, 21)},1`);
      const text = lines.join('\n');
      const reader = new TimestampReader('iso', zone, [0]);
      const shared = createTimestampParser({ layout: 'iso', timeZone: zone });
      const bounds = createFieldBounds();
      let p = 0;
      for (const line of lines) {
        splitFields(text, p, p + line.length, 'comma', bounds);
        expect(reader.read(text, bounds), `${zone} ${line}`).toBe(shared(line.slice(0, line.indexOf(','))));
        p += line.length + 1;
      }
    }
  });

  it('read timestamps to the same instant as the shared parser, for every layout, zone and fraction', () => {
    const layouts: { id: TimestampLayout; write: (d: Date) => string }[] = [
      { id: 'iso', write: (d) => `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 23)}` },
      { id: 'dmy', write: (d) => `${String(d.getUTCDate()).padStart(2, '0')}.${String(d.getUTCMonth() + 1).padStart(2, '0')}.${d.getUTCFullYear()} ${d.toISOString().slice(11, 22)}` },
      {
        id: 'mdy',
        write: (d) => {
          const h = d.getUTCHours();
          return `${String(d.getUTCMonth() + 1).padStart(2, '0')}/${String(d.getUTCDate()).padStart(2, '0')}/${d.getUTCFullYear()} ${String(h % 12 || 12).padStart(2, '0')}:${d.toISOString().slice(14, 21)} ${h < 12 ? 'AM' : 'PM'}`;
        },
      },
    ];
    const bounds = createFieldBounds();
    fc.assert(
      fc.property(
        fc.integer({ min: Date.UTC(2000, 0, 1), max: Date.UTC(2040, 0, 1) }),
        fc.constantFrom('UTC', 'Europe/Berlin', 'America/New_York', 'Asia/Kolkata'),
        fc.constantFrom(0, 1, 2),
        (ms, zone, l) => {
          const { id, write } = layouts[l];
          const text = `${write(new Date(ms))},1`;
          splitFields(text, 0, text.length, 'comma', bounds);
          const reader = new TimestampReader(id, zone, [0]);
          const shared = createTimestampParser({ layout: id, timeZone: zone });
          const fieldText = text.slice(0, text.indexOf(','));
          // Twice: the second read comes from the cached minute.
          expect(reader.read(text, bounds)).toBe(shared(fieldText));
          expect(reader.read(text, bounds)).toBe(shared(fieldText));
        },
      ),
      { numRuns: 500 },
    );
  });
});

describe('reading straight from the uploaded bytes, a few megabytes at a time', () => {
  const both = (bytes: Uint8Array, chunkBytes: number) => {
    const text = decodeRecordFile(bytes).text;
    const d = detectLayout(text);
    const mapping = { ...d.mapping!, time: { ...d.mapping!.time, timeZone: 'Europe/Berlin' } };
    return { fromText: parseSeries(text, d.layout, mapping), fromBytes: parseSeriesFromBytes(bytes, d.layout, mapping, { chunkBytes }) };
  };

  it.each(['vented-comma.csv', 'absolute-semicolon.csv', 'baro-tab.txt', 'iso-offset.csv', 'date-time-columns.csv', 'whitespace-elapsed.txt'])(
    'gives what the text reader gives for %s, in chunks of 97 bytes',
    (name) => {
      const { fromText, fromBytes } = both(fixtureBytes(name), 97);
      expect(Array.from(fromBytes.timeSeconds)).toEqual(Array.from(fromText.timeSeconds));
      expect(Array.from(fromBytes.value)).toEqual(Array.from(fromText.value));
      expect([fromBytes.firstLine, fromBytes.lastLine]).toEqual([fromText.firstLine, fromText.lastLine]);
    },
  );

  it('numbers the lines of problems across chunks as the text reader does', () => {
    const bytes = fixtureBytes('malformed.csv');
    const text = decodeRecordFile(bytes).text;
    const layout = detectLayout(text).layout;
    const fromBytes = caught(() => parseSeriesFromBytes(bytes, layout, ELAPSED_MAPPING, { chunkBytes: 20 }));
    expect(fromBytes.issues).toEqual(caught(() => parseSeries(text, layout, ELAPSED_MAPPING)).issues);
  });

  it('reads a UTF-8 byte-order mark, a Windows-1252 degree sign, UTF-16 and carriage-return line ends as the text reader does', () => {
    const rows = 'Zeit (s);Pegel °C (m)\n0;1,5\n1;1,4\n2;1,3\n';
    const layout: FileLayout = { delimiter: 'semicolon', headerLine: 1, unitsLine: null, firstDataLine: 2, lastDataLine: null, decimalComma: true };
    const mapping: ColumnMapping = { time: { columns: [0], format: 's' }, valueColumn: 1 };
    const latin = Uint8Array.from(Buffer.from(rows, 'latin1'));
    const utf16 = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(rows, 'utf16le')]);
    const bom = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(rows, 'utf8')]);
    const classicMac = Buffer.from(rows.replace(/\n/g, '\r'), 'utf8');
    for (const bytes of [latin, utf16, bom, classicMac]) expect(Array.from(parseSeriesFromBytes(bytes, layout, mapping, { chunkBytes: 7 }).value)).toEqual([1.5, 1.4, 1.3]);
  });
});
