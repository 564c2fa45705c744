import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RecordFile } from '../../server/features/records/record-file.entity';
import { RecordSeries } from '../../server/features/records/record-series.entity';
import { RecordEntity } from '../../server/features/records/record.entity';
import { Well } from '../../server/features/wells/well.entity';
import type { ApiClient } from '../support/test-server';
import { demoEmail, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
let analyst: ApiClient;
let viewer: ApiClient;
let wellId: string;

beforeAll(async () => {
  ts = await startTestServer();
  analyst = await ts.as(demoEmail('Analyst'));
  viewer = await ts.as(demoEmail('Viewer'));
  wellId = (await ts.ds.getRepository(Well).findOneByOrFail({ siteId: ts.demoSiteId, name: 'MW-15' })).id;
});
afterAll(async () => ts.close());

const fixture = (name: string) => fs.readFileSync(path.resolve(__dirname, '../fixtures/loggers', name));
const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

const ABSOLUTE = {
  testType: 'slug-out',
  reference: 'absolute',
  layout: { delimiter: 'semicolon', headerLine: 6, unitsLine: null, firstDataLine: 7, lastDataLine: null, decimalComma: true },
  mapping: { time: { columns: [0], format: 'timestamp', timestampLayout: 'dmy', timeZone: 'UTC' }, valueColumn: 1 },
  valueUnit: 'mbar',
  waterDensityKgM3: 1000,
  fieldCrew: 'T. Ferreira, invented crew',
  notes: 'Invented test upload',
  barometric: {
    layout: { delimiter: 'tab', headerLine: 3, unitsLine: 4, firstDataLine: 5, lastDataLine: null, decimalComma: false },
    mapping: { time: { columns: [0], format: 'timestamp', timestampLayout: 'mdy', timeZone: 'UTC' }, valueColumn: 1 },
    valueUnit: 'kPa',
  },
};

const ELAPSED = {
  testType: 'slug-out',
  reference: 'vented',
  layout: { delimiter: 'comma', headerLine: 2, unitsLine: null, firstDataLine: 3, lastDataLine: null, decimalComma: false },
  mapping: { time: { columns: [0], format: 's' }, valueColumn: 1 },
  valueUnit: 'm',
};

/** A small elapsed-time logger file (vented head in m) with the given data lines after its header. */
const elapsedFile = (rows: string[]) => Buffer.from(['Invented example', 'Elapsed (s),Level (m)', ...rows].join('\n') + '\n');
const recoveryRows = (n = 30) =>
  Array.from({ length: n }, (_, i) => `${i},${(i < 4 ? 3 : 3 - 0.5 * Math.exp(-(i - 4) / 6)).toFixed(4)}`);

function upload(c: ApiClient, settings: object | string, file?: { bytes: Buffer; name: string }, barometric?: { bytes: Buffer; name: string }) {
  let r = c.agent.post(`/api/wells/${wellId}/records`).set('x-csrf-token', c.csrf).field('settings', typeof settings === 'string' ? settings : JSON.stringify(settings));
  if (file) r = r.attach('file', file.bytes, { filename: file.name, contentType: 'text/csv' });
  if (barometric) r = r.attach('barometric', barometric.bytes, { filename: barometric.name, contentType: 'text/plain' });
  return r;
}

async function storedCounts() {
  return {
    records: await ts.ds.getRepository(RecordEntity).count(),
    files: await ts.ds.getRepository(RecordFile).count(),
    series: await ts.ds.getRepository(RecordSeries).count(),
  };
}

/** Runs `send`, expects a 400 whose fields include every key of `fields`, and checks nothing was stored. */
async function refused(send: () => PromiseLike<{ status: number; body: { error: { message: string; fields?: Record<string, string> } } }>, fields: string[]) {
  const before = await storedCounts();
  const r = await send();
  expect(r.status, JSON.stringify(r.body)).toBe(400);
  for (const f of fields) expect(Object.keys(r.body.error.fields ?? {}), r.body.error.message).toContain(f);
  expect(await storedCounts()).toEqual(before);
  return r.body.error;
}

describe('the records routes in the OpenAPI document', () => {
  it('are all there, the upload documented as multipart (file, barometric, settings JSON) and as JSON tape readings', async () => {
    const doc = (await ts.client().get('/api/openapi.json')).body;
    const upload = doc.paths['/api/wells/{wellId}/records'].post;
    expect(Object.keys(upload.requestBody.content).sort()).toEqual(['application/json', 'multipart/form-data']);
    expect(Object.keys(upload.requestBody.content['multipart/form-data'].schema.properties).sort()).toEqual(['barometric', 'file', 'settings']);
    expect(upload.requestBody.content['application/json'].schema.properties.readings).toBeTruthy();
    expect(upload.responses['413']).toBeTruthy();
    expect(doc.paths['/api/records/preview'].post.summary).toMatch(/without storing/);
    for (const [p, m] of [['/api/wells/{wellId}/records', 'get'], ['/api/records/{recordId}', 'get'], ['/api/records/{recordId}', 'delete'], ['/api/records/{recordId}/series', 'get'], ['/api/records/{recordId}/file', 'get']]) {
      expect(doc.paths[p]?.[m]?.summary, `${m} ${p}`).toBeTruthy();
    }
    expect(doc.paths['/api/records/{recordId}/series'].get.parameters.map((x: { name: string }) => x.name).sort()).toEqual(['points', 'recordId', 'scale']);
  });
});

describe('POST /api/records/preview', () => {
  it('detects the layout of an absolute-pressure export and its barometric file, and suggests a mapping, test start and static level', async () => {
    const r = await analyst.agent
      .post('/api/records/preview')
      .set('x-csrf-token', analyst.csrf)
      .attach('file', fixture('absolute-semicolon.csv'), 'absolute-semicolon.csv')
      .attach('barometric', fixture('baro-tab.txt'), 'baro-tab.txt');
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.file.layout).toEqual({ delimiter: 'semicolon', headerLine: 6, unitsLine: null, firstDataLine: 7, lastDataLine: null, decimalComma: true });
    expect(r.body.file.mapping).toMatchObject({ time: { columns: [0], format: 'timestamp', timestampLayout: 'dmy' }, valueColumn: 1 });
    expect(r.body.file.reference).toBe('absolute');
    expect(r.body.file.valueUnit).toBe('mbar');
    expect(r.body.file.rows[0]).toEqual({ line: 7, fields: ['03.06.2024 14:20:00', '1306,70', '12,0'] });
    expect(r.body.file.readings).toBe(80);
    expect(r.body.barometric.layout).toMatchObject({ delimiter: 'tab', headerLine: 3, unitsLine: 4, firstDataLine: 5 });
    expect(r.body.barometric.valueUnit).toBe('kPa');
    // The fixture's step is at the fifth reading (8 s after the first); static head 3.0 m, H0 0.5 m.
    expect(r.body.suggestion.testStartSeconds).toBe(8);
    expect(r.body.suggestion.staticLevelM).toBeCloseTo(3.0, 2);
    expect(r.body.suggestion.h0M).toBeCloseTo(0.5, 2);
    expect(r.body.suggestion.direction).toBe('rising-head');
    expect(r.body.suggestion.testDate).toBe('2024-06-03');
    expect(await storedCounts()).toMatchObject({ records: expect.any(Number) });
  });

  it('re-reads the file with a layout and mapping the user changed, and reports their problems by line instead of failing', async () => {
    const settings = { layout: { ...ABSOLUTE.layout, decimalComma: false }, mapping: ABSOLUTE.mapping };
    const r = await analyst.agent
      .post('/api/records/preview')
      .set('x-csrf-token', analyst.csrf)
      .field('settings', JSON.stringify(settings))
      .attach('file', fixture('absolute-semicolon.csv'), 'absolute-semicolon.csv');
    expect(r.status).toBe(200);
    expect(r.body.file.layout.decimalComma).toBe(false);
    expect(r.body.file.problems[0]).toBe('Line 7: "1306,70" in column "Pressure (mbar)" is not a number');
    expect(r.body.suggestion).toBeNull();
  });

  it('reads only whole lines of a file sent in part', async () => {
    const bytes = fixture('vented-comma.csv');
    const cut = bytes.subarray(0, bytes.length - 7);
    const r = await analyst.agent
      .post('/api/records/preview')
      .set('x-csrf-token', analyst.csrf)
      .field('sampled', 'file')
      .attach('file', cut, 'vented-comma.csv');
    expect(r.status).toBe(200);
    expect(r.body.file.sampled).toBe(true);
    expect(r.body.file.problems).toEqual([]);
    expect(r.body.file.readings).toBe(59);
  });

  it('refuses an empty file, a binary file and a request without a file', async () => {
    const send = (bytes?: Buffer) => {
      const q = analyst.agent.post('/api/records/preview').set('x-csrf-token', analyst.csrf).field('settings', '{}');
      return bytes ? q.attach('file', bytes, 'x.csv') : q;
    };
    expect((await send(Buffer.alloc(0))).body.error.fields.file).toBe('is empty (0 bytes)');
    expect((await send(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]))).body.error.fields.file).toMatch(/not a text file/);
    expect((await send()).status).toBe(400);
  });
});

describe('a logger record', () => {
  let recordId: string;

  it('imports an absolute-pressure file with its barometric file, keeps both verbatim and stores the reduction', async () => {
    const r = await upload(analyst, ABSOLUTE, { bytes: fixture('absolute-semicolon.csv'), name: 'absolute-semicolon.csv' }, { bytes: fixture('baro-tab.txt'), name: 'baro-tab.txt' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    recordId = r.body.id;
    expect(r.body).toMatchObject({
      wellId,
      siteId: ts.demoSiteId,
      wellName: 'MW-15',
      testType: 'slug-out',
      source: 'logger',
      reference: 'absolute',
      direction: 'rising-head',
      sampleCount: 80,
      testDate: '2024-06-03',
      startedAt: '2024-06-03T14:20:08.000Z',
      testStartSeconds: 8,
      testStartSource: 'detected',
      staticSource: 'pre-test',
      preTestCount: 4,
      clock: 'epoch',
      fieldCrew: 'T. Ferreira, invented crew',
      warnings: [],
      createdBy: { name: 'Tomas Ferreira' },
    });
    expect(r.body.h0M).toBeCloseTo(0.5, 2);
    expect(r.body.staticLevelM).toBeCloseTo(3.0, 2);
    expect(r.body.files.map((f: { which: string }) => f.which)).toEqual(['raw', 'barometric']);
    expect(r.body.files[0]).toMatchObject({ name: 'absolute-semicolon.csv', mediaType: 'text/csv', sizeBytes: fixture('absolute-semicolon.csv').length });
    expect(r.body.settings.mapping.time.timestampLayout).toBe('dmy');
  });

  it('is read by any member of the site and listed under its well', async () => {
    const one = await viewer.get(`/api/records/${recordId}`);
    expect(one.status).toBe(200);
    expect(one.body.id).toBe(recordId);
    const list = await viewer.get(`/api/wells/${wellId}/records`);
    expect(list.status).toBe(200);
    expect(list.body.records.map((x: { id: string }) => x.id)).toContain(recordId);
  });

  it('downloads both files byte for byte, with their SHA-256 and name', async () => {
    for (const [which, name] of [['raw', 'absolute-semicolon.csv'], ['barometric', 'baro-tab.txt']] as const) {
      const original = fixture(name);
      const r = await viewer.get(`/api/records/${recordId}/file?which=${which}`).buffer(true).parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
      expect(r.status).toBe(200);
      expect(Buffer.compare(r.body as Buffer, original)).toBe(0);
      expect(r.headers['x-content-sha256']).toBe(sha256(original));
      expect(r.headers['content-disposition']).toContain(`filename="${name}"`);
    }
    expect((await viewer.get(`/api/records/${recordId}/file?which=nonsense`)).status).toBe(400);
  });

  it('serves the normalized head from the test start, 1 at the start and falling, downsampled to the points asked for', async () => {
    const full = await viewer.get(`/api/records/${recordId}/series?points=5000`);
    expect(full.status).toBe(200);
    expect(full.body.readings).toBe(80);
    expect(full.body.elapsedSeconds[0]).toBe(0);
    expect(full.body.normalizedHead[0]).toBe(1);
    expect(full.body.omitted).toBe(4);
    expect(full.body.plottable).toBe(76);
    const few = await viewer.get(`/api/records/${recordId}/series?points=10`);
    expect(few.body.elapsedSeconds).toHaveLength(10);
    expect(few.body.elapsedSeconds[0]).toBe(full.body.elapsedSeconds[0]);
    expect(few.body.elapsedSeconds[9]).toBe(full.body.elapsedSeconds.at(-1));
    expect((await viewer.get(`/api/records/${recordId}/series?points=2`)).status).toBe(400);
  });

  it('serves an oscillating record on a linear axis with its readings below static, and breaks the log line where they were left out', async () => {
    const well = await ts.ds.getRepository(Well).findOneByOrFail({ siteId: ts.demoSiteId, name: 'MW-08' });
    const [osc] = (await viewer.get(`/api/wells/${well.id}/records`)).body.records;
    const log = await viewer.get(`/api/records/${osc.id}/series?points=5000`);
    expect(log.body.scale).toBe('log');
    expect(log.body.belowStatic).toBeGreaterThan(100);
    expect(log.body.segmentStarts.length).toBeGreaterThan(3);
    expect(Math.min(...log.body.normalizedHead)).toBeGreaterThan(0);
    const linear = await viewer.get(`/api/records/${osc.id}/series?scale=linear&points=5000`);
    expect(linear.body.plottable).toBe(log.body.plottable + log.body.belowStatic);
    expect(Math.min(...linear.body.normalizedHead)).toBeLessThan(-0.2);
    expect(linear.body.segmentStarts).toEqual([]);
    expect((await viewer.get(`/api/records/${osc.id}/series?scale=sideways`)).status).toBe(400);
  });

  it('is deleted with its files and series by an Analyst, not by a Viewer', async () => {
    expect((await viewer.delete(`/api/records/${recordId}`)).status).toBe(403);
    expect((await analyst.delete(`/api/records/${recordId}`)).status).toBe(204);
    expect((await viewer.get(`/api/records/${recordId}`)).status).toBe(404);
    expect(await ts.ds.getRepository(RecordFile).countBy({ recordId })).toBe(0);
    expect(await ts.ds.getRepository(RecordSeries).countBy({ recordId })).toBe(0);
  });

  it('answers 404 for a record or well that does not exist', async () => {
    const missing = '00000000-0000-4000-8000-000000000000';
    expect((await viewer.get(`/api/records/${missing}`)).status).toBe(404);
    expect((await viewer.get(`/api/records/${missing}/series`)).status).toBe(404);
    expect((await viewer.get(`/api/wells/${missing}/records`)).status).toBe(404);
  });

  it('reads the other fixture layouts: elapsed minutes in aligned columns, and date and time columns with a footer', async () => {
    const cases: { file: string; settings: object; count: number }[] = [
      {
        file: 'whitespace-elapsed.txt',
        settings: { testType: 'bail-down', reference: 'depth', layout: { delimiter: 'whitespace', headerLine: 4, firstDataLine: 6 }, mapping: { time: { columns: [0], format: 'min' }, valueColumn: 1 }, valueUnit: 'ft', staticLevel: { value: 13.99, unit: 'ft' } },
        count: 40,
      },
      {
        file: 'date-time-columns.csv',
        settings: { testType: 'slug-in', reference: 'vented', layout: { delimiter: 'comma', headerLine: 1, firstDataLine: 2, lastDataLine: 31 }, mapping: { time: { columns: [0, 1], format: 'timestamp', timestampLayout: 'iso', timeZone: 'America/Chicago' }, valueColumn: 2 }, valueUnit: 'ft' },
        count: 30,
      },
    ];
    for (const c of cases) {
      const r = await upload(analyst, c.settings, { bytes: fixture(c.file), name: c.file });
      expect(r.status, `${c.file}: ${JSON.stringify(r.body)}`).toBe(201);
      expect(r.body.sampleCount).toBe(c.count);
      expect(r.body.warnings).toEqual([]);
    }
  });
});

describe('tape readings', () => {
  it('are typed as mm:ss with a static level and stored with a CSV of what was typed', async () => {
    const readings = [
      ['0:00', 14.87], ['0:01', 14.59], ['0:02', 14.37], ['0:03', 14.2], ['0:04', 14.11], ['0:05', 14.05], ['0:06', 14.03], ['0:07', 14.01], ['0:08', 14.0],
    ].map(([time, depth]) => ({ time, depth }));
    const r = await analyst.post(`/api/wells/${wellId}/records`, { testType: 'bail-down', readings, timeFormat: 'mm:ss', units: 'ft', static: 13.99, testDate: '2024-05-02', fieldCrew: 'Invented crew' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body).toMatchObject({ source: 'tape', reference: 'depth', sampleCount: 9, direction: 'rising-head', testDate: '2024-05-02', staticSource: 'entered', clock: 'elapsed' });
    // CE 4363 worked example (Cleveland 1999): H0 = 14.87 − 13.99 = 0.88 ft
    expect(r.body.h0M).toBeCloseTo(0.88 * 0.3048, 10);
    const file = await analyst.get(`/api/records/${r.body.id}/file`);
    expect(file.text.split('\r\n').slice(0, 3)).toEqual(['time (mm:ss),depth to water below measuring point (ft)', '0:00,14.87', '0:01,14.59']);
    const series = await analyst.get(`/api/records/${r.body.id}/series`);
    expect(series.body.normalizedHead[0]).toBe(1);
  });

  it('warn when the direction does not match the test type, and when H0 is far from the slug volume’s', async () => {
    const readings = [0, 1, 2, 3, 4, 5].map((t) => ({ time: t, depth: 2 + 0.3 * Math.exp(-t) }));
    const r = await analyst.post(`/api/wells/${wellId}/records`, { testType: 'slug-in', readings, timeFormat: 's', units: 'm', static: 2, slugVolume: { value: 1, unit: 'L' } });
    expect(r.status).toBe(201);
    expect(r.body.warnings).toHaveLength(2);
    expect(r.body.warnings[0]).toMatch(/slug-in test should be falling-head/);
    expect(r.body.warnings[1]).toMatch(/slug volume/);
  });
});

describe('bad input is refused with the field or line named, and nothing is stored', () => {
  it('malformed lines, non-numeric values, times going backwards and empty values: every line numbered', async () => {
    const e = await refused(() => upload(analyst, { ...ELAPSED, layout: { ...ELAPSED.layout } }, { bytes: fixture('malformed.csv'), name: 'malformed.csv' }), [
      'file',
      'file.lines.6',
      'file.lines.8',
      'file.lines.10',
      'file.lines.12',
    ]);
    expect(e.fields!['file.lines.6']).toBe('expected 2 fields, found 3');
    expect(e.fields!['file.lines.8']).toBe('"n/a" in column "Level (m)" is not a number');
    expect(e.fields!['file.lines.10']).toBe('time 5.5 goes backwards from 6 on line 9');
    expect(e.fields!['file.lines.12']).toBe('column "Level (m)" is empty');
    expect(e.message).toMatch(/^The logger file: The logger file has 4 problems — line 6/);
  });

  it('a non-numeric value on its own', async () => {
    const rows = recoveryRows();
    rows[10] = '10,1.2.3';
    const e = await refused(() => upload(analyst, ELAPSED, { bytes: elapsedFile(rows), name: 'x.csv' }), ['file.lines.13']);
    expect(e.message).toBe('The logger file: line 13: "1.2.3" in column "Level (m)" is not a number');
  });

  it('time going backwards on its own', async () => {
    const rows = recoveryRows();
    rows[20] = `19.5,${rows[20].split(',')[1]}`;
    rows[21] = `19.5,${rows[21].split(',')[1]}`;
    const e = await refused(() => upload(analyst, ELAPSED, { bytes: elapsedFile(rows), name: 'x.csv' }), ['file.lines.24']);
    expect(e.fields!['file.lines.24']).toBe('time 19.5 repeats the time on line 23; times must increase');
  });

  it('a barometric file that does not cover the record', async () => {
    const settings = { ...ABSOLUTE, barometric: { ...ABSOLUTE.barometric, clockOffsetSeconds: 3600 } };
    const e = await refused(
      () => upload(analyst, settings, { bytes: fixture('absolute-semicolon.csv'), name: 'a.csv' }, { bytes: fixture('baro-tab.txt'), name: 'b.txt' }),
      ['barometric'],
    );
    expect(e.fields!.barometric).toMatch(/must cover the whole record/);
  });

  it('an absolute record without a barometric file, and a barometric file with a vented record', async () => {
    await refused(() => upload(analyst, ABSOLUTE, { bytes: fixture('absolute-semicolon.csv'), name: 'a.csv' }), ['barometric']);
    await refused(() => upload(analyst, ELAPSED, { bytes: elapsedFile(recoveryRows()), name: 'x.csv' }, { bytes: fixture('baro-tab.txt'), name: 'b.txt' }), ['barometric']);
  });

  it('a record with no displacement', async () => {
    const flat = Array.from({ length: 20 }, (_, i) => `${i},3.000`);
    const e = await refused(() => upload(analyst, ELAPSED, { bytes: elapsedFile(flat), name: 'flat.csv' }), ['file']);
    expect(e.fields!.file).toBe('shows no displacement: every reading is 3 m; check the value column and its unit');
    const atStatic = await refused(() => upload(analyst, { ...ELAPSED, staticLevel: { value: 3, unit: 'm' }, testStartSeconds: 0 }, { bytes: elapsedFile(recoveryRows()), name: 'x.csv' }), ['file']);
    expect(atStatic.fields!.file).toMatch(/no displacement at the test start/);
  });

  it('an unknown unit, and a length unit for an absolute sensor', async () => {
    const e = await refused(() => upload(analyst, { ...ELAPSED, valueUnit: 'furlong' }, { bytes: elapsedFile(recoveryRows()), name: 'x.csv' }), ['settings.valueUnit']);
    expect(e.fields!['settings.valueUnit']).toMatch(/unknown unit "furlong"/);
    await refused(() => upload(analyst, { ...ABSOLUTE, valueUnit: 'm' }, { bytes: fixture('absolute-semicolon.csv'), name: 'a.csv' }, { bytes: fixture('baro-tab.txt'), name: 'b.txt' }), ['settings.valueUnit']);
    await refused(() => analyst.post(`/api/wells/${wellId}/records`, { testType: 'slug-in', readings: [{ time: 0, depth: 1 }, { time: 1, depth: 2 }, { time: 2, depth: 3 }], timeFormat: 's', units: 'yd' }), ['units']);
  });

  it('an empty file and a file that is not text', async () => {
    const empty = await refused(() => upload(analyst, ELAPSED, { bytes: Buffer.alloc(0), name: 'empty.csv' }), ['file']);
    expect(empty.fields!.file).toBe('is empty (0 bytes)');
    const blank = await refused(() => upload(analyst, ELAPSED, { bytes: Buffer.from('\n\n  \n'), name: 'blank.csv' }), ['file']);
    expect(blank.fields!.file).toMatch(/no readings/);
    const png = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.alloc(64, 0)]);
    const binary = await refused(() => upload(analyst, ELAPSED, { bytes: png, name: 'picture.png' }), ['file']);
    expect(binary.fields!.file).toMatch(/not a text file/);
  });

  it('a mapping that points at a missing column', async () => {
    const e = await refused(() => upload(analyst, { ...ELAPSED, mapping: { ...ELAPSED.mapping, valueColumn: 5 } }, { bytes: elapsedFile(recoveryRows()), name: 'x.csv' }), [
      'settings.mapping.valueColumn',
    ]);
    expect(e.fields!['settings.mapping.valueColumn']).toBe('column 5 does not exist; the file has 2 columns: 0 "Elapsed (s)", 1 "Level (m)"');
  });

  it('missing or malformed settings, and no file at all', async () => {
    await refused(() => upload(analyst, '{not json', { bytes: elapsedFile(recoveryRows()), name: 'x.csv' }), ['settings']);
    await refused(() => upload(analyst, { ...ELAPSED, reference: 'sideways' }, { bytes: elapsedFile(recoveryRows()), name: 'x.csv' }), ['settings.reference']);
    await refused(() => upload(analyst, ELAPSED), ['file']);
  });

  it('tape readings whose time goes backwards, too few readings, or a bad mm:ss', async () => {
    const post = (body: object) => () => analyst.post(`/api/wells/${wellId}/records`, { testType: 'slug-in', timeFormat: 's', units: 'm', ...body });
    const back = await refused(post({ readings: [{ time: 0, depth: 3 }, { time: 5, depth: 2.5 }, { time: 10, depth: 2.2 }, { time: 8, depth: 2.1 }] }), ['readings.3.time']);
    expect(back.fields!['readings.3.time']).toMatch(/reading 4 \(8\) does not come after reading 3 \(10\)/);
    await refused(post({ readings: [{ time: 0, depth: 3 }] }), ['readings']);
    await refused(post({ timeFormat: 'mm:ss', readings: [{ time: '0:00', depth: 3 }, { time: '0:7x', depth: 2.5 }, { time: '0:20', depth: 2.2 }] }), ['readings.1.time']);
  });
});

describe('odd files and settings', () => {
  const ODD: [string, Buffer][] = [
    ['one column', Buffer.from('level\n1\n2\n3\n')],
    ['header only', Buffer.from('time,level\n')],
    ['one very long line', Buffer.from(`${'9,'.repeat(20000)}9\n`)],
    ['only quotes', Buffer.from('"""\n"a""b"\n"\n')],
    ['words', Buffer.from('the quick brown fox\njumps over\nthe lazy dog\n')],
    ['CR line ends', Buffer.from('t,level\r0,1\r1,0.5\r2,0.25\r')],
    ['UTF-16', Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('t,level\n0,1\n1,0.5\n2,0.25\n3,0.1\n', 'utf16le')])],
  ];

  it('are answered with a preview or a 400, never a 5xx, and nothing is stored', async () => {
    const before = await storedCounts();
    for (const [name, bytes] of ODD) {
      const p = await analyst.agent.post('/api/records/preview').set('x-csrf-token', analyst.csrf).attach('file', bytes, 'odd.csv');
      expect([200, 400], `preview of ${name}: ${p.status}`).toContain(p.status);
      const u = await upload(analyst, ELAPSED, { bytes, name: 'odd.csv' });
      expect(u.status, `upload of ${name}: ${JSON.stringify(u.body)}`).toBe(400);
    }
    for (const settings of [
      { ...ELAPSED, layout: { ...ELAPSED.layout, firstDataLine: 999 } },
      { ...ELAPSED, layout: { ...ELAPSED.layout, headerLine: 5, firstDataLine: 3 } },
      { ...ELAPSED, mapping: { time: { columns: [0, 0, 0, 0], format: 'timestamp' }, valueColumn: 1 } },
      { ...ELAPSED, mapping: { time: { columns: [0], format: 'timestamp', timestampLayout: 'iso', timeZone: 'Mars/Olympus_Mons' }, valueColumn: 1 } },
      { ...ELAPSED, mapping: { time: { columns: [1], format: 's' }, valueColumn: 1 } },
      { ...ELAPSED, testStartSeconds: 1e9 },
      { ...ELAPSED, staticLevel: { value: 'high', unit: 'm' } },
    ]) {
      const u = await upload(analyst, settings, { bytes: elapsedFile(recoveryRows()), name: 'x.csv' });
      expect(u.status, JSON.stringify(u.body)).toBe(400);
      expect(Object.keys(u.body.error.fields ?? {}).length).toBeGreaterThan(0);
    }
    expect(await storedCounts()).toEqual(before);
  });
});

describe('a file over RECORD_MAX_UPLOAD_MB', () => {
  let small: TestServer;
  beforeAll(async () => {
    small = await startTestServer({ RECORD_MAX_UPLOAD_MB: '0.05' });
  });
  afterAll(async () => small.close());

  it('gets 413 with the limit named, and nothing is stored', async () => {
    const c = await small.as(demoEmail('Analyst'));
    const well = await small.ds.getRepository(Well).findOneByOrFail({ siteId: small.demoSiteId, name: 'MW-15' });
    const before = await small.ds.getRepository(RecordEntity).count();
    const big = elapsedFile(Array.from({ length: 6000 }, (_, i) => `${i},${(3 + i * 1e-6).toFixed(6)}`));
    const r = await c.agent.post(`/api/wells/${well.id}/records`).set('x-csrf-token', c.csrf).field('settings', JSON.stringify(ELAPSED)).attach('file', big, 'big.csv');
    expect(r.status).toBe(413);
    expect(r.body.error.message).toBe('The logger file is larger than the upload limit of 0.05 MB (RECORD_MAX_UPLOAD_MB)');
    expect(await small.ds.getRepository(RecordEntity).count()).toBe(before);
  });
});

describe('a logger file of one million readings', () => {
  it('imports, and its series comes back downsampled with the first and last points', async () => {
    const n = 1_000_000;
    const lines: string[] = ['Invented 10 Hz vented logger export (made up for this test)', 'Elapsed (s),Level (m)'];
    for (let i = 0; i < n; i++) {
      const t = i / 10;
      lines.push(`${t.toFixed(1)},${(t < 30 ? 4 : 4 - 0.6 * Math.exp(-(t - 30) / 20000)).toFixed(5)}`);
    }
    const bytes = Buffer.from(lines.join('\n') + '\n');
    const r = await upload(analyst, ELAPSED, { bytes, name: 'million.csv' });
    expect(r.status, JSON.stringify(r.body).slice(0, 500)).toBe(201);
    expect(r.body.sampleCount).toBe(n);
    expect(r.body.testStartSeconds).toBeCloseTo(30, 6);
    expect(r.body.files[0].sha256).toBe(sha256(bytes));
    // The import ran its checkpoint itself and gave SQLite back its automatic one.
    expect((await ts.ds.query('PRAGMA wal_autocheckpoint'))[0].wal_autocheckpoint).toBe(1000);
    const s = await analyst.get(`/api/records/${r.body.id}/series?points=2000`);
    expect(s.status).toBe(200);
    expect(s.body.elapsedSeconds).toHaveLength(2000);
    expect(s.body.elapsedSeconds[0]).toBe(0);
    expect(s.body.normalizedHead[0]).toBe(1);
    expect(s.body.elapsedSeconds[1999]).toBeCloseTo(n / 10 - 0.1 - 30, 6);
    // The kept points lie on the curve that was uploaded: H/H0 = exp(−t / 20 000 s), to the file's 5 decimals.
    s.body.elapsedSeconds.forEach((t: number, i: number) => expect(Math.abs(s.body.normalizedHead[i] - Math.exp(-t / 20000))).toBeLessThan(2e-5));
    await analyst.delete(`/api/records/${r.body.id}`).expect(204);
  }, 60_000);
});
