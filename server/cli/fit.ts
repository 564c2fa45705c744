import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { analyzeRecord, type Analysis, type AnalyzeInput } from '../../shared/hydraulics/analyze';
import { EngineInputError, OscillatingResponseError } from '../../shared/hydraulics/errors';
import type { FitLine, FitMethod, FitWindow } from '../../shared/hydraulics/fitting';
import type { WellGeometry } from '../../shared/hydraulics/geometry';
import { findMaterial, type MaterialId } from '../../shared/hydraulics/materials';
import type { ReductionSettings, ReferenceMode } from '../../shared/hydraulics/reduction';
import { isKUnit, kFromSi, K_UNITS, type KUnit } from '../../shared/units/conductivity';
import { isLengthUnit, lengthFromSi, lengthToSi, type LengthUnit } from '../../shared/units/length';
import { isPressureUnit, pressureToSi, pressureToWaterHeadM, type PressureUnit } from '../../shared/units/pressure';
import { isTimeColumnFormat, parseClockDuration, timeFromSi, timeToSi, type TimeColumnFormat } from '../../shared/units/time';
import { createTimestampParser, type TimestampLayout } from '../../shared/units/timestamp';

const USAGE = `Usage: npm run fit -- <record.csv> --method hvorslev|bouwer-rice --rc <r> --R <r> --L <len> [options]

The CSV holds two columns, time and value, with an optional header row; lines starting with # are
skipped; the delimiter is a comma, semicolon or tab.

Geometry (in --units, or --geometry-units):
  --rc <r>            radius of the casing in which the water level moves
  --R <r>             radius of the screen (Hvorslev's intake radius)
  --rw <r>            radius of the borehole / filter pack (default: --R)
  --intake screen|borehole   which radius is the intake, Hvorslev's R and Bouwer-Rice's rw
                      (default: the screen for Hvorslev, the borehole for Bouwer-Rice)
  --L <len>           length of the screen (intake)
  --Lw <len>          Bouwer-Rice: static water level to the bottom of the screen
  --D <len>           Bouwer-Rice: saturated thickness (equal to --Lw when fully penetrating)
  --n <porosity>      filter-pack porosity, when the level moves within the pack
  --anisotropy <r>    Kh/Kv (default 1)
Record:
  --units m|cm|mm|ft|in        length unit of values, static level and geometry (default m)
  --geometry-units <unit>      length unit of the geometry, if it differs
  --reference depth|vented|absolute   depth below the measuring point (default), head above a
                               vented sensor, or absolute pressure (needs --baro)
  --pressure-unit Pa|kPa|psi|mbar|hPa|mH2O|ftH2O   unit of pressures: absolute and barometric
                               (default Pa), or a vented sensor's gauge pressure, read as head
                               P / (ρ g) with --density (and --static in the same unit)
  --baro <file.csv>            barometric record (time, pressure) on the same clock
  --density <kg/m3>            water density for pressures (default 1000)
  --time-unit s|min|h|d|mm:ss|timestamp   how the time column is written (default s)
  --time-layout iso|ymd|mdy|dmy   timestamp layout (default iso)
  --time-zone <IANA zone>      zone of timestamps without an offset (default UTC)
  --static <level>             static level (default: mean of the pre-test readings)
  --start <time>               test start, written like the time column (default: at the step)
Fit:
  --line anchored|free         (default anchored)
  --window-head <upper>,<lower>   window in H/H0, e.g. 0.3,0.2
  --window-time <from>,<to>    window in elapsed time since the start (--time-unit, or s)
  --allow-oscillation          fit an oscillating record anyway
  --slug-volume <litres>       to compare measured and expected H0
  --material <id>              to compare K with the material's range
  --k-unit m/s|cm/s|m/d|ft/d|gpd/ft2   second unit to print K in (default m/d, ft/d for ft or in)
`;

export class CliUsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'CliUsageError';
  }
}

export interface CliIo {
  readFile(path: string): string;
}

const nodeIo: CliIo = { readFile: (path) => readFileSync(path, 'utf8') };

interface Columns {
  time: string[];
  value: Float64Array;
}

function splitCsv(text: string, file: string): Columns {
  const time: string[] = [];
  const values: number[] = [];
  let delimiter: string | undefined;
  let lineNumber = 0;
  for (const raw of text.split(/\r?\n/)) {
    lineNumber++;
    const line = raw.trim();
    if (line === '' || line.startsWith('#')) continue;
    delimiter ??= line.includes('\t') ? '\t' : line.includes(';') ? ';' : ',';
    const cells = line.split(delimiter).map((c) => c.trim().replace(/^"(.*)"$/, '$1'));
    if (cells.length < 2) throw new CliUsageError(`${file}:${lineNumber}: expected two columns (time${delimiter}value)`);
    const value = Number(delimiter === ';' ? cells[1].replace(',', '.') : cells[1]);
    if (cells[1] === '' || !Number.isFinite(value)) {
      if (time.length === 0 && values.length === 0) continue; // the header row
      throw new CliUsageError(`${file}:${lineNumber}: "${cells[1]}" is not a number`);
    }
    time.push(cells[0]);
    values.push(value);
  }
  return { time, value: Float64Array.from(values) };
}

type TimeParser = (text: string, field: string) => number;

function timeParser(format: TimeColumnFormat, layout: TimestampLayout, timeZone: string): TimeParser {
  if (format === 'mm:ss') return (text, field) => parseClockDuration(text, field);
  if (format === 'timestamp') {
    const parse = createTimestampParser({ layout, timeZone });
    return (text, field) => parse(text, field);
  }
  return (text, field) => {
    const x = Number(text);
    if (text === '' || !Number.isFinite(x)) throw new EngineInputError(field, `"${text}" is not a number of ${format}`);
    return timeToSi(x, format);
  };
}

function parseTimes(texts: readonly string[], parse: TimeParser, file: string): Float64Array {
  const out = new Float64Array(texts.length);
  for (let i = 0; i < texts.length; i++) out[i] = parse(texts[i], `${file} time, row ${i + 1}`);
  return out;
}

function num(name: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const x = Number(text);
  if (text.trim() === '' || !Number.isFinite(x)) throw new CliUsageError(`--${name}: "${text}" is not a number`);
  return x;
}

function pair(name: string, text: string | undefined): [number, number] | undefined {
  if (text === undefined) return undefined;
  const parts = text.split(',');
  if (parts.length !== 2) throw new CliUsageError(`--${name}: expected two numbers separated by a comma (got "${text}")`);
  return [num(name, parts[0]) as number, num(name, parts[1]) as number];
}

function oneOf<T extends string>(name: string, text: string | undefined, allowed: readonly T[], fallback: T): T {
  if (text === undefined) return fallback;
  if (!(allowed as readonly string[]).includes(text)) throw new CliUsageError(`--${name}: "${text}" is not one of ${allowed.join(', ')}`);
  return text as T;
}

const g4 = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(4)).toString() : String(x));
const e3 = (x: number) => x.toExponential(3);

function describeWindow(a: Analysis, timeUnitLabel: string, toUser: (s: number) => number): string {
  const w = a.fit.window;
  const range = w.window.kind === 'head' ? `H/H0 ${w.window.upper}–${w.window.lower}` : `t = ${g4(toUser(w.window.fromSeconds))}–${g4(toUser(w.window.toSeconds))} ${timeUnitLabel}`;
  return `${range} (${w.source}), ${w.count} readings at t = ${g4(toUser(w.fromSeconds))}–${g4(toUser(w.toSeconds))} ${timeUnitLabel}, H/H0 ${g4(w.headMax)}–${g4(w.headMin)}`;
}

/** Runs the engine on a CSV record as the command line would and returns the report text. */
export function main(argv: readonly string[], io: CliIo = nodeIo): string {
  const { values: o, positionals } = parseArgs({
    args: [...argv],
    allowPositionals: true,
    strict: true,
    options: {
      method: { type: 'string' },
      rc: { type: 'string' },
      R: { type: 'string' },
      rw: { type: 'string' },
      intake: { type: 'string' },
      L: { type: 'string' },
      Lw: { type: 'string' },
      D: { type: 'string' },
      n: { type: 'string' },
      anisotropy: { type: 'string' },
      units: { type: 'string' },
      'geometry-units': { type: 'string' },
      reference: { type: 'string' },
      'pressure-unit': { type: 'string' },
      baro: { type: 'string' },
      density: { type: 'string' },
      'time-unit': { type: 'string' },
      'time-layout': { type: 'string' },
      'time-zone': { type: 'string' },
      static: { type: 'string' },
      start: { type: 'string' },
      line: { type: 'string' },
      'window-head': { type: 'string' },
      'window-time': { type: 'string' },
      'allow-oscillation': { type: 'boolean' },
      'slug-volume': { type: 'string' },
      material: { type: 'string' },
      'k-unit': { type: 'string' },
      help: { type: 'boolean', short: 'h' },
    },
  });
  if (o.help) return USAGE;
  if (positionals.length !== 1) throw new CliUsageError(`expected one record file, got ${positionals.length}\n\n${USAGE}`);
  const file = positionals[0];

  if (o.method === undefined) throw new CliUsageError('--method is required (hvorslev or bouwer-rice)');
  const method = oneOf<FitMethod>('method', o.method, ['hvorslev', 'bouwer-rice'], 'hvorslev');
  const units = o.units ?? 'm';
  if (!isLengthUnit(units)) throw new CliUsageError(`--units: "${units}" is not one of m, cm, mm, ft, in`);
  const geometryUnits = o['geometry-units'] ?? units;
  if (!isLengthUnit(geometryUnits)) throw new CliUsageError(`--geometry-units: "${geometryUnits}" is not one of m, cm, mm, ft, in`);
  const reference = oneOf<ReferenceMode>('reference', o.reference, ['depth', 'vented', 'absolute'], 'depth');
  const timeFormat = o['time-unit'] ?? 's';
  if (!isTimeColumnFormat(timeFormat)) throw new CliUsageError(`--time-unit: "${timeFormat}" is not one of s, min, h, d, mm:ss, timestamp`);
  const layout = oneOf<TimestampLayout>('time-layout', o['time-layout'], ['iso', 'ymd', 'mdy', 'dmy'], 'iso');
  const parseTime = timeParser(timeFormat, layout, o['time-zone'] ?? 'UTC');
  const line = oneOf<FitLine>('line', o.line, ['anchored', 'free'], 'anchored');
  const kUnitText = o['k-unit'] ?? (units === 'ft' || units === 'in' ? 'ft/d' : 'm/d');
  if (!isKUnit(kUnitText)) throw new CliUsageError(`--k-unit: "${kUnitText}" is not one of ${K_UNITS.map((u) => u.id).join(', ')}`);
  const kUnit: KUnit = kUnitText;
  const density = num('density', o.density) ?? 1000;
  const pressureUnitText = o['pressure-unit'] ?? 'Pa';
  if (!isPressureUnit(pressureUnitText)) throw new CliUsageError(`--pressure-unit: "${pressureUnitText}" is not a pressure unit`);
  const pressureUnit: PressureUnit = pressureUnitText;
  if (reference === 'depth' && o['pressure-unit'] !== undefined) {
    throw new CliUsageError('--pressure-unit: a depth below the measuring point is a length; use --units, or --reference vented or absolute for a pressure record');
  }
  // A vented record in a pressure unit: the gauge pressure is the water column above the sensor.
  const ventedPressure = reference === 'vented' && o['pressure-unit'] !== undefined;

  const geo = (name: string, text: string | undefined): number | undefined => {
    const x = num(name, text);
    return x === undefined ? undefined : lengthToSi(x, geometryUnits as LengthUnit);
  };
  const required = (name: string, text: string | undefined): number => {
    const x = geo(name, text);
    if (x === undefined) throw new CliUsageError(`--${name} is required`);
    return x;
  };
  const geometry: WellGeometry = {
    casingRadiusM: required('rc', o.rc),
    screenRadiusM: required('R', o.R),
    boreholeRadiusM: geo('rw', o.rw),
    screenLengthM: required('L', o.L),
    intake: o.intake === undefined ? undefined : oneOf<'screen' | 'borehole'>('intake', o.intake, ['screen', 'borehole'], 'screen'),
    anisotropyRatio: num('anisotropy', o.anisotropy),
    filterPackPorosity: num('n', o.n),
    staticToScreenBottomM: geo('Lw', o.Lw),
    saturatedThicknessM: geo('D', o.D),
  };

  const columns = splitCsv(io.readFile(file), file);
  const timeSeconds = parseTimes(columns.time, parseTime, file);
  const value =
    reference === 'absolute'
      ? Float64Array.from(columns.value, (p) => pressureToSi(p, pressureUnit, density))
      : ventedPressure
        ? Float64Array.from(columns.value, (p) => pressureToWaterHeadM(p, pressureUnit, density))
        : Float64Array.from(columns.value, (x) => lengthToSi(x, units));

  const reduction: ReductionSettings = { reference };
  const staticLevel = num('static', o.static);
  if (staticLevel !== undefined) reduction.staticLevelM = ventedPressure ? pressureToWaterHeadM(staticLevel, pressureUnit, density) : lengthToSi(staticLevel, units);
  if (o.start !== undefined) reduction.testStartSeconds = parseTime(o.start, '--start');
  if (reference === 'absolute') {
    if (o.baro === undefined) throw new CliUsageError('--baro is required with --reference absolute');
    const baro = splitCsv(io.readFile(o.baro), o.baro);
    reduction.barometric = {
      timeSeconds: parseTimes(baro.time, parseTime, o.baro),
      pressurePa: Float64Array.from(baro.value, (p) => pressureToSi(p, pressureUnit, density)),
    };
    reduction.waterDensityKgM3 = density;
  }

  const elapsedUnit = timeFormat === 'mm:ss' || timeFormat === 'timestamp' ? 's' : timeFormat;
  let window: FitWindow | undefined;
  const head = pair('window-head', o['window-head']);
  const time = pair('window-time', o['window-time']);
  if (head && time) throw new CliUsageError('give --window-head or --window-time, not both');
  if (head) window = { kind: 'head', upper: Math.max(...head), lower: Math.min(...head) };
  if (time) window = { kind: 'time', fromSeconds: timeToSi(time[0], elapsedUnit), toSeconds: timeToSi(time[1], elapsedUnit) };

  const slugLitres = num('slug-volume', o['slug-volume']);
  if (o.material !== undefined && !findMaterial(o.material)) throw new CliUsageError(`--material: unknown material "${o.material}"`);
  const input: AnalyzeInput = {
    record: { timeSeconds, value },
    reduction,
    method,
    geometry,
    line,
    window,
    allowOscillation: o['allow-oscillation'] ?? false,
    slugVolumeM3: slugLitres === undefined ? undefined : slugLitres / 1000,
    material: o.material as MaterialId | undefined,
  };
  const a = analyzeRecord(input);
  return report(file, a, { units, elapsedUnit, kUnit, startIsTimestamp: timeFormat === 'timestamp' });
}

function report(file: string, a: Analysis, opts: { units: LengthUnit; elapsedUnit: 's' | 'min' | 'h' | 'd'; kUnit: KUnit; startIsTimestamp: boolean }): string {
  const { reduced: r, fit, k } = a;
  const len = (m: number) => `${g4(lengthFromSi(m, opts.units))} ${opts.units}`;
  const toUser = (s: number) => timeFromSi(s, opts.elapsedUnit);
  const start = opts.startIsTimestamp ? new Date(r.testStartSeconds * 1000).toISOString() : `t = ${g4(toUser(r.testStartSeconds))} ${opts.elapsedUnit}`;
  const lines = [
    `Kfield fit of ${file}`,
    `Record: ${r.elapsedSeconds.length} readings, ${r.reference === 'depth' ? 'depth below the measuring point' : r.reference === 'vented' ? 'head above a vented sensor' : 'absolute pressure with barometric compensation'}, ${r.testType} test`,
    `Static level: ${len(r.staticLevelM)} (${r.staticSource === 'entered' ? 'entered' : `mean of ${r.preTestCount} pre-test readings`})`,
    `Test start: ${start} (${r.testStartSource}), H0 = ${len(Math.abs(r.h0M))}`,
    `Line: ${fit.line}, ${fit.reference}`,
    `Window: ${describeWindow(a, opts.elapsedUnit, toUser)}`,
    `Slope = ${e3(fit.slopePerSecond)} 1/s, intercept = ${g4(fit.intercept)}, r² = ${fit.rSquared.toFixed(5)}, n = ${fit.count}`,
    `T0 = ${g4(fit.t0Seconds)} s; the line crosses H/H0 = 1/e at ${g4(fit.lineCrossingSeconds)} s` +
      (fit.recordCrossingSeconds === null ? '' : `, the record at ${g4(fit.recordCrossingSeconds)} s`),
    `Method: ${k.reference}`,
  ];
  if (k.method === 'hvorslev') {
    lines.push(`Shape: mL/D = ${g4(k.mLOverD)}, F = ${len(k.shapeFactorM)}${k.casingRadiusIsEffective ? `, effective rc = ${len(k.casingRadiusM)}` : ''}`);
  } else {
    lines.push(
      `Shape: Le/rw = ${g4(k.leOverRw)}, ln(Re/rw) = ${g4(k.lnReOverRw)}, ${k.penetration} penetration${k.capApplied ? ', ln((D − Lw)/rw) capped at 6' : ''}` +
        `${k.casingRadiusIsEffective ? `, effective rc = ${len(k.casingRadiusM)}` : ''}`,
    );
  }
  lines.push(`K = ${e3(k.kMetersPerSecond)} m/s = ${g4(kFromSi(k.kMetersPerSecond, opts.kUnit))} ${K_UNITS.find((u) => u.id === opts.kUnit)?.label}`);
  if (k.method === 'hvorslev') {
    lines.push(`K (simplified form, ${k.simplified.valid ? 'valid' : 'outside its validity'}) = ${e3(k.simplified.kMetersPerSecond)} m/s`);
  }
  if (a.flags.length === 0) lines.push('Flags: none');
  else {
    lines.push('Flags:');
    for (const f of a.flags) lines.push(`  [${f.severity}] ${f.code}: ${f.message}${f.suggestion ? ` ${f.suggestion}` : ''}`);
  }
  return lines.join('\n') + '\n';
}

function run(): void {
  try {
    process.stdout.write(main(process.argv.slice(2)));
  } catch (e) {
    if (e instanceof OscillatingResponseError) {
      process.stderr.write(`${e.flag.message}\nRun with --allow-oscillation to fit it anyway.\n`);
    } else if (e instanceof EngineInputError || e instanceof CliUsageError || (e instanceof TypeError && 'code' in e)) {
      process.stderr.write(`${e.message}\n`);
    } else {
      throw e;
    }
    process.exitCode = 1;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) run();
