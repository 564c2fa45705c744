import type { EntityManager } from 'typeorm';
import { hvorslevT0Seconds } from '@shared/hydraulics/hvorslev';
import type { LoggerSettings, RecordTestType, TapeBody } from '@shared/schemas/records';
import { lengthFromSi } from '@shared/units/length';
import { PASCALS_PER_PSI, STANDARD_GRAVITY } from '@shared/units/pressure';
import { zoneOffsetMs } from '@shared/units/timestamp';
import { wellGeometry } from '../../features/fits/fits.service';
import { readLogger, readTape, tapeCsv } from '../../features/records/records.reading';
import { storeRecord } from '../../features/records/records.service';
import type { Site } from '../../features/sites/site.entity';
import { User } from '../../features/users/user.entity';
import { Well } from '../../features/wells/well.entity';
import { demoTrueK } from './demo-wells';

/*
 * The demo site's recovery-test records. Everything here is invented: the responses are computed
 * from the Hvorslev model, H/H0 = exp(−t/T0), with T0 from the invented K field (demoTrueK) and
 * each well's construction (the engine's formula, inverted), plus a little noise; one high-K well
 * gets an underdamped (oscillating) response instead. The logger files are written as a logger
 * export would be (preamble, header, units) and go through the same reading and reduction as an
 * upload, then are stored verbatim. No real instrument, site, person or data.
 */

const TIME_ZONE = 'Europe/Berlin';
const WATER_DENSITY = 1000;
const RHO_G = WATER_DENSITY * STANDARD_GRAVITY;
const INVENTED = 'Invented demo record, generated from the Hvorslev model with small noise; not a measurement.';

/** A small deterministic generator, so the demo is the same on every start. */
function noise(seed: number): (amplitude: number) => number {
  let s = seed >>> 0;
  return (amplitude) => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return (s / 4294967296 - 0.5) * 2 * amplitude;
  };
}

const pad = (n: number, w = 2) => String(n).padStart(w, '0');

let cachedSecond = NaN;
let cachedLayout = '';
let cachedText = '';

/** Wall-clock text of an instant in the demo's zone, written by `layout` (the text of each whole second is reused). */
function wallClock(epochMs: number, offsetMs: number, layout: 'ymd-dash' | 'dmy-dot' | 'mdy-ampm', fractionDigits = 0): string {
  const wallMs = epochMs + offsetMs;
  const second = Math.floor(wallMs / 1000);
  const frac = fractionDigits > 0 ? `.${String(Math.floor((wallMs - second * 1000) / 10 ** (3 - fractionDigits))).padStart(fractionDigits, '0')}` : '';
  if (second !== cachedSecond || layout !== cachedLayout) {
    cachedSecond = second;
    cachedLayout = layout;
    cachedText = wholeSecond(second * 1000, layout);
  }
  if (layout === 'mdy-ampm') return cachedText;
  return cachedText + frac;
}

function wholeSecond(wallMs: number, layout: 'ymd-dash' | 'dmy-dot' | 'mdy-ampm'): string {
  const d = new Date(wallMs);
  const Y = d.getUTCFullYear();
  const M = pad(d.getUTCMonth() + 1);
  const D = pad(d.getUTCDate());
  const h = d.getUTCHours();
  const m = pad(d.getUTCMinutes());
  const s = pad(d.getUTCSeconds());
  if (layout === 'ymd-dash') return `${Y}-${M}-${D} ${pad(h)}:${m}:${s}`;
  if (layout === 'dmy-dot') return `${D}.${M}.${Y} ${pad(h)}:${m}:${s}`;
  const h12 = h % 12 === 0 ? 12 : h % 12;
  return `${M}/${D}/${Y} ${pad(h12)}:${m}:${s} ${h < 12 ? 'AM' : 'PM'}`;
}

/** Lines of a file written into byte chunks as they come, so a long file never exists as an array of strings. */
class FileWriter {
  private readonly parts: Buffer[] = [];
  private lines: string[] = [];
  constructor(private readonly eol: string) {}

  push(...lines: string[]): void {
    for (const l of lines) this.lines.push(l);
    if (this.lines.length >= 5000) this.flush();
  }

  private flush(): void {
    if (this.lines.length) this.parts.push(Buffer.from(this.lines.join(this.eol) + this.eol, 'utf8'));
    this.lines = [];
  }

  bytes(): Buffer {
    this.flush();
    return Buffer.concat(this.parts);
  }
}

/** Displacement from static at time t after the start (m): the Hvorslev curve, or a damped cosine. */
type Response = (t: number) => number;
const hvorslev = (h0: number, t0: number): Response => (t) => (t < 0 ? 0 : h0 * Math.exp(-t / t0));
const underdamped = (h0: number, periodS: number, dampingS: number): Response => (t) =>
  t < 0 ? 0 : h0 * Math.exp(-t / dampingS) * Math.cos((2 * Math.PI * t) / periodS);

interface Plan {
  well: string;
  kind: 'tape' | 'vented' | 'absolute' | 'long' | 'oscillating';
  testType: RecordTestType;
  /** Test start, local wall time on the demo day. */
  start: [number, number, number, number, number];
  h0M: number;
  crew: string;
}

// Rising-head tests (bail-down, slug-out) start with the level below static; slug-in above it.
const PLANS: Plan[] = [
  { well: 'MW-01', kind: 'tape', testType: 'bail-down', start: [2025, 4, 14, 9, 20], h0M: 0.9, crew: 'L. Brandt and K. Osei (invented)' },
  { well: 'MW-03', kind: 'tape', testType: 'slug-out', start: [2025, 4, 14, 10, 5], h0M: 0.45, crew: 'L. Brandt and K. Osei (invented)' },
  { well: 'MW-05', kind: 'tape', testType: 'bail-down', start: [2025, 4, 14, 11, 40], h0M: 0.7, crew: 'L. Brandt and K. Osei (invented)' },
  { well: 'MW-11', kind: 'tape', testType: 'slug-in', start: [2025, 4, 15, 9, 10], h0M: 0.5, crew: 'K. Osei (invented)' },
  { well: 'MW-19', kind: 'tape', testType: 'bail-down', start: [2025, 4, 15, 13, 30], h0M: 1.1, crew: 'K. Osei (invented)' },
  { well: 'MW-07', kind: 'vented', testType: 'slug-in', start: [2025, 4, 16, 9, 2], h0M: 0.6, crew: 'P. Varga (invented)' },
  { well: 'MW-10', kind: 'vented', testType: 'slug-out', start: [2025, 4, 16, 10, 15], h0M: 0.55, crew: 'P. Varga (invented)' },
  { well: 'MW-12', kind: 'vented', testType: 'slug-out', start: [2025, 4, 16, 11, 30], h0M: 0.5, crew: 'P. Varga (invented)' },
  { well: 'MW-14', kind: 'vented', testType: 'slug-in', start: [2025, 4, 16, 14, 0], h0M: 0.65, crew: 'P. Varga (invented)' },
  { well: 'MW-16', kind: 'vented', testType: 'slug-out', start: [2025, 4, 17, 9, 45], h0M: 0.6, crew: 'P. Varga (invented)' },
  { well: 'MW-04', kind: 'absolute', testType: 'slug-out', start: [2025, 4, 17, 11, 0], h0M: 0.5, crew: 'L. Brandt (invented)' },
  { well: 'MW-15', kind: 'absolute', testType: 'slug-in', start: [2025, 4, 17, 13, 20], h0M: 0.45, crew: 'L. Brandt (invented)' },
  { well: 'MW-17', kind: 'absolute', testType: 'slug-out', start: [2025, 4, 18, 9, 30], h0M: 0.55, crew: 'L. Brandt (invented)' },
  { well: 'MW-03D', kind: 'absolute', testType: 'bail-down', start: [2025, 4, 18, 8, 0], h0M: 1.2, crew: 'L. Brandt (invented)' },
  { well: 'MW-14D', kind: 'absolute', testType: 'bail-down', start: [2025, 4, 19, 8, 15], h0M: 1.0, crew: 'L. Brandt (invented)' },
  { well: 'MW-20', kind: 'vented', testType: 'slug-out', start: [2025, 4, 19, 10, 0], h0M: 0.6, crew: 'P. Varga (invented)' },
  // The long file: a 10 Hz logger left running for 5.5 h in a slow silt well, so the recovery fills it.
  { well: 'MW-19D', kind: 'long', testType: 'slug-in', start: [2025, 4, 20, 7, 30], h0M: 0.8, crew: 'P. Varga (invented)' },
  { well: 'MW-08', kind: 'oscillating', testType: 'slug-out', start: [2025, 4, 17, 15, 10], h0M: 0.4, crew: 'P. Varga (invented)' },
];

/** Rows in the long logger file: 10 Hz for 20 000 s, the logger left running after the test. */
export const DEMO_LONG_ROWS = 200_000;

interface Generated {
  kind: 'tape' | 'logger';
  tape?: TapeBody;
  settings?: LoggerSettings;
  file?: { name: string; mediaType: string; content: Buffer };
  barometric?: { name: string; mediaType: string; content: Buffer };
}

function tapeRecord(plan: Plan, well: Well, t0: number, jitter: (a: number) => number): Generated {
  const staticDepth = well.staticWaterDepthM ?? 3;
  const sign = plan.testType === 'slug-in' ? -1 : 1;
  const response = hvorslev(plan.h0M, t0);
  // Readings as a field crew takes them: every 15 s at first, then less often, until ~95 % recovery.
  const times: number[] = [];
  for (let t = 0; t <= Math.max(3 * t0, 60) && times.length < 60; t += t < 120 ? 15 : t < 600 ? 30 : 60) times.push(t);
  const inFeet = plan.well === 'MW-19' || plan.well === 'MW-05';
  const units = inFeet ? 'ft' : 'm';
  const readings = times.map((t) => {
    const depthM = staticDepth + sign * response(t) + jitter(0.002);
    const depth = inFeet ? Number(lengthFromSi(depthM, 'ft').toFixed(2)) : Number(depthM.toFixed(3));
    return { time: `${Math.floor(t / 60)}:${pad(t % 60)}`, depth };
  });
  const staticValue = inFeet ? Number(lengthFromSi(staticDepth, 'ft').toFixed(2)) : Number(staticDepth.toFixed(3));
  return {
    kind: 'tape',
    tape: {
      source: 'tape',
      testType: plan.testType,
      readings,
      timeFormat: 'mm:ss',
      units,
      static: staticValue,
      testDate: `${plan.start[0]}-${pad(plan.start[1] + 1)}-${pad(plan.start[2])}`,
      fieldCrew: plan.crew,
      notes: `${INVENTED} Tape readings below the top of casing.`,
    },
  };
}

function loggerRecord(plan: Plan, well: Well, t0: number, jitter: (a: number) => number): Generated {
  const [y, mo, d, h, mi] = plan.start;
  const wallStartMs = Date.UTC(y, mo, d, h, mi, 0);
  const offsetMs = zoneOffsetMs(TIME_ZONE, wallStartMs);
  const startMs = wallStartMs - offsetMs;
  const sign = plan.testType === 'slug-in' ? -1 : 1;
  const response = plan.kind === 'oscillating' ? underdamped(plan.h0M, 3.2, 4.5) : hvorslev(plan.h0M, t0);
  // Sensor hung about 2 m below static; the logger starts a minute before the test.
  const sensorHeadM = 2 + ((well.saturatedThicknessM ?? 8) % 1.5);
  // A sampling interval a logger offers, about T0/20, so that every curve has enough readings.
  const dt = plan.kind === 'long' || plan.kind === 'oscillating' ? 0.1 : ([30, 10, 5, 2, 1, 0.5, 0.2, 0.1].find((s) => s <= t0 / 20) ?? 0.1);
  const preS = plan.kind === 'long' ? 60 : Math.max(10 * dt, 60);
  const rows = plan.kind === 'long' ? DEMO_LONG_ROWS : Math.ceil((preS + (plan.kind === 'oscillating' ? 45 : Math.max(6 * t0, 30))) / dt);
  const headAt = (t: number) => sensorHeadM - sign * response(t);
  const testDate = `${y}-${pad(mo + 1)}-${pad(d)}`;
  const serial = 40000 + (plan.well.charCodeAt(3) * 97 + plan.well.length * 13);

  if (plan.kind === 'absolute') {
    // Water logger on local time, 1 decimal comma, mbar; the barometer on UTC, its own interval, kPa.
    const baroPa = (epochMs: number) => 101_325 - 420 + 180 * Math.sin(epochMs / 3.6e6 / 5) + 40 * Math.sin(epochMs / 3.6e6 / 0.7);
    const lines = new FileWriter('\r\n');
    lines.push(
      'Invented demo export - no real instrument, site or data',
      `Instrument;Fictional absolute pressure logger AP-3 (invented), serial ${serial}`,
      `Well;${plan.well}`,
      `Clock;local time (${TIME_ZONE})`,
      `Interval;${String(dt).replace('.', ',')} s`,
      '',
      'Date/Time;Pressure;Temperature',
      ';mbar;°C',
    );
    for (let i = 0; i < rows; i++) {
      const t = i * dt - preS;
      const ms = startMs + t * 1000;
      const pa = baroPa(ms) + headAt(t) * RHO_G + jitter(8);
      lines.push(`${wallClock(ms, offsetMs, 'dmy-dot', dt < 1 ? 1 : 0)};${(pa / 100).toFixed(2).replace('.', ',')};${(10.4 + jitter(0.05)).toFixed(2).replace('.', ',')}`);
    }
    const baroLines = ['Barometric logger BL-1 (invented demo export)', 'Clock: UTC', 'Interval: 300 s', 'Date and time\tBarometric pressure\tAir temperature', '\t(kPa)\t(C)'];
    const baroFrom = startMs - preS * 1000 - 900_000;
    const baroTo = startMs + (rows * dt - preS) * 1000 + 900_000;
    for (let ms = Math.floor(baroFrom / 300_000) * 300_000; ms <= baroTo; ms += 300_000) {
      baroLines.push(`${wallClock(ms, 0, 'mdy-ampm')}\t${(baroPa(ms) / 1000 + jitter(0.003)).toFixed(3)}\t${(14 + jitter(1)).toFixed(1)}`);
    }
    const settings: LoggerSettings = {
      testType: plan.testType,
      testDate,
      fieldCrew: plan.crew,
      notes: `${INVENTED} Absolute (non-vented) logger compensated with the site barometer.`,
      reference: 'absolute',
      layout: { delimiter: 'semicolon', headerLine: 7, unitsLine: 8, firstDataLine: 9, lastDataLine: null, decimalComma: true },
      mapping: { time: { columns: [0], format: 'timestamp', timestampLayout: 'dmy', timeZone: TIME_ZONE }, valueColumn: 1 },
      valueUnit: 'mbar',
      waterDensityKgM3: WATER_DENSITY,
      barometric: {
        layout: { delimiter: 'tab', headerLine: 4, unitsLine: 5, firstDataLine: 6, lastDataLine: null, decimalComma: false },
        mapping: { time: { columns: [0], format: 'timestamp', timestampLayout: 'mdy', timeZone: 'UTC' }, valueColumn: 1 },
        valueUnit: 'kPa',
        clockOffsetSeconds: 0,
      },
    };
    return {
      kind: 'logger',
      settings,
      file: { name: `${plan.well}-${testDate}-absolute.csv`, mediaType: 'text/csv', content: lines.bytes() },
      barometric: { name: `site-barometer-${testDate}.txt`, mediaType: 'text/plain', content: Buffer.from(`${baroLines.join('\n')}\n`, 'utf8') },
    };
  }

  // Vented loggers: comma-separated, timestamp and elapsed seconds; head in m (or psi for one).
  const inPsi = plan.well === 'MW-12';
  const lines = new FileWriter('\n');
  lines.push(
    'Invented demo export - no real instrument, site or data',
    `Instrument,Fictional vented level logger VL-8 (invented)`,
    `Serial number,${serial}`,
    `Well,${plan.well}`,
    'Time zone,UTC+02:00',
    `Sample interval,${dt} s`,
    '',
    `Timestamp,Elapsed,${inPsi ? 'Pressure' : 'Level'},Temperature`,
    `,s,${inPsi ? 'psi' : 'm'},degC`,
  );
  const digits = dt < 1 ? 1 : 0;
  for (let i = 0; i < rows; i++) {
    const t = i * dt - preS;
    const ms = startMs + Math.round(t * 1000);
    const head = headAt(t) + jitter(plan.kind === 'long' ? 0.0015 : 0.001);
    const value = inPsi ? ((head * RHO_G) / PASCALS_PER_PSI).toFixed(4) : head.toFixed(4);
    lines.push(`${wallClock(ms, offsetMs, 'ymd-dash', digits)},${(i * dt).toFixed(digits)},${value},${(9.8 + jitter(0.05)).toFixed(2)}`);
  }
  const settings: LoggerSettings = {
    testType: plan.testType,
    testDate,
    fieldCrew: plan.crew,
    notes:
      plan.kind === 'oscillating'
        ? `Invented demo record: an underdamped (oscillating) response of a high-K well in the buried channel, computed as a damped cosine, not from the Hvorslev model; not a measurement.`
        : plan.kind === 'long'
          ? `${INVENTED} A 10 Hz logger left running for five and a half hours in a slow well in the silt.`
          : `${INVENTED} Vented logger, head above the sensor.`,
    reference: 'vented',
    layout: { delimiter: 'comma', headerLine: 8, unitsLine: 9, firstDataLine: 10, lastDataLine: null, decimalComma: false },
    mapping: { time: { columns: [0], format: 'timestamp', timestampLayout: 'iso', timeZone: TIME_ZONE }, valueColumn: 2 },
    valueUnit: inPsi ? 'psi' : 'm',
    waterDensityKgM3: WATER_DENSITY,
  };
  return {
    kind: 'logger',
    settings,
    file: { name: `${plan.well}-${testDate}-${plan.kind === 'long' ? 'long-deployment' : 'vented'}.csv`, mediaType: 'text/csv', content: lines.bytes() },
  };
}

/** Adds the invented records to the demo site's wells (inside the demo seed's transaction). */
export async function seedDemoRecords(m: EntityManager, site: Site): Promise<number> {
  return (await storePlans(m, site, PLANS, 0)).length;
}

/**
 * Re-tests along the invented buried channel, recorded after the first round of fits, so that the
 * K surface has Checked values along it (demo-surface.ts fits and checks them).
 */
const CHANNEL_PLANS: Plan[] = [
  { well: 'MW-10', kind: 'vented', testType: 'slug-in', start: [2025, 5, 3, 9, 10], h0M: 0.5, crew: 'P. Varga (invented)' },
  { well: 'MW-12', kind: 'vented', testType: 'slug-in', start: [2025, 5, 3, 10, 20], h0M: 0.45, crew: 'P. Varga (invented)' },
  { well: 'MW-13', kind: 'vented', testType: 'slug-out', start: [2025, 5, 3, 11, 40], h0M: 0.5, crew: 'P. Varga (invented)' },
  { well: 'MW-18', kind: 'vented', testType: 'slug-out', start: [2025, 5, 3, 13, 15], h0M: 0.55, crew: 'P. Varga (invented)' },
];

export async function seedDemoChannelRecords(m: EntityManager, site: Site): Promise<string[]> {
  return storePlans(m, site, CHANNEL_PLANS, PLANS.length);
}

async function storePlans(m: EntityManager, site: Site, plans: Plan[], seedOffset: number): Promise<string[]> {
  const wells = new Map((await m.getRepository(Well).find({ where: { siteId: site.id } })).map((w) => [w.name, w]));
  const analyst = await m.getRepository(User).findOne({ where: { email: 'analyst@demo.kfield.example' } });
  const ids: string[] = [];
  for (const [j, plan] of plans.entries()) {
    const i = j + seedOffset;
    const well = wells.get(plan.well);
    if (!well) continue;
    const k = demoTrueK(well.siteX, well.siteY, well.hydroUnit);
    const t0 = hvorslevT0Seconds(wellGeometry(well), k);
    const jitter = noise(1000 + i * 7919);
    const g = plan.kind === 'tape' ? tapeRecord(plan, well, t0, jitter) : loggerRecord(plan, well, t0, jitter);
    let stored;
    if (g.kind === 'tape') {
      const body = g.tape!;
      const { readings: _r, fieldCrew, notes, ...settings } = body;
      stored = await storeRecord(m, {
        well, userId: analyst?.id ?? null, source: 'tape', testType: body.testType, reference: 'depth', settings, read: readTape(body),
        fieldCrew, notes, files: [{ role: 'raw', name: 'tape-readings.csv', mediaType: 'text/csv', content: Buffer.from(tapeCsv(body), 'utf8') }], isDemo: true,
      });
    } else {
      const settings = g.settings!;
      const read = readLogger({ file: g.file!.content, barometric: g.barometric?.content, settings });
      stored = await storeRecord(m, {
        well, userId: analyst?.id ?? null, source: 'logger', testType: settings.testType, reference: settings.reference,
        settings: settings as unknown as Record<string, unknown>, read, fieldCrew: settings.fieldCrew, notes: settings.notes,
        files: [{ role: 'raw', ...g.file! }, ...(g.barometric ? [{ role: 'barometric' as const, ...g.barometric }] : [])], isDemo: true,
      });
    }
    ids.push(stored);
  }
  return ids;
}
