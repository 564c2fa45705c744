import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { REFERENCE_MODES, type ReferenceMode } from '@shared/hydraulics/reduction';
import type { FileLayout } from '@shared/records/types';
import {
  RECORD_TEST_TYPE_LABELS,
  RECORD_TEST_TYPES,
  type FilePreview,
  type LoggerSettingsInput,
  type Preview,
  type PreviewSettings,
  type RecordDto,
  type RecordTestType,
} from '@shared/schemas/records';
import { LENGTH_UNITS, lengthFromSi, type LengthUnit } from '@shared/units/length';
import { isPressureUnit, PRESSURE_UNITS, pressureFromSi, STANDARD_GRAVITY } from '@shared/units/pressure';
import { VOLUME_UNITS, type VolumeUnit } from '@shared/units/volume';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { previewLoggerFiles, uploadLoggerRecord } from '../api';
import { formatBytes, formatCount, formatDuration } from '../format';
import { FileLayoutFields, MappingFields, PreviewTable, type Mapping } from './file-layout-fields';
import { PreviewCurve, type CurveMarker } from './preview-curve';

/** Short enough for a select on a phone. */
const REFERENCE_SHORT: Record<ReferenceMode, string> = {
  depth: 'Depth below the measuring point',
  vented: 'Head above a vented sensor',
  absolute: 'Absolute pressure (+ barometer)',
};

type FileChoice = { layout: FileLayout; mapping: Mapping | null; valueUnit: string | null };

const browserZone = () => Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
const allZones = (): string[] => {
  const intl = Intl as unknown as { supportedValuesOf?: (k: string) => string[] };
  return intl.supportedValuesOf ? intl.supportedValuesOf('timeZone') : ['UTC'];
};

const numberOrUndefined = (text: string): number | undefined => {
  const t = text.trim();
  if (t === '') return undefined;
  const n = Number(t.replace(',', '.'));
  return Number.isFinite(n) ? n : undefined;
};

/** The choice for a file from a preview: what the server read or suggests, with a zone for its timestamps. */
function choiceOf(p: FilePreview, zone: string): FileChoice {
  // A zone named in the file wins; otherwise the browser's (loggers usually keep local time).
  const mapping = p.mapping ? { ...p.mapping, time: { ...p.mapping.time, timeZone: p.timeZone ?? zone } } : null;
  return { layout: p.layout, mapping, valueUnit: p.valueUnit };
}

function Problems({ preview, what }: { preview: FilePreview; what: string }) {
  if (preview.problems.length === 0) return null;
  return (
    <Alert tone="error" title={`${what}: these lines cannot be read with this layout and mapping`}>
      <ul className="list-disc space-y-0.5 pl-5">
        {preview.problems.slice(0, 8).map((p) => (
          <li key={p}>{p}</li>
        ))}
      </ul>
      {preview.problems.length > 8 ? <p className="mt-1">and {preview.problems.length - 8} more.</p> : null}
    </Alert>
  );
}

function Notes({ notes }: { notes: string[] }) {
  if (notes.length === 0) return null;
  return (
    <Alert tone="info" title="Check these">
      <ul className="list-disc space-y-0.5 pl-5">
        {notes.map((n) => (
          <li key={n}>{n}</li>
        ))}
      </ul>
    </Alert>
  );
}

function FileSummary({ preview }: { preview: FilePreview }) {
  return (
    <p className="text-xs text-slate-600">
      {preview.name}, {formatBytes(preview.sizeBytes)}, {preview.encoding.toUpperCase()}.{' '}
      {preview.sampled ? `Read from the first ${formatCount(preview.totalLines)} lines (the rest is read on upload): ` : ''}
      {formatCount(preview.readings)} readings
      {preview.firstTime !== null && preview.lastTime !== null ? ` over ${formatDuration(preview.lastTime - preview.firstTime)}` : ''}.
    </p>
  );
}

function Preamble({ lines, first }: { lines: string[]; first: number }) {
  if (lines.length === 0) return null;
  return (
    <details className="rounded-md bg-slate-50 px-3 py-2 text-xs ring-1 ring-slate-200">
      <summary className="cursor-pointer text-slate-700">
        {lines.length} {lines.length === 1 ? 'line' : 'lines'} before the header (the logger’s own notes)
      </summary>
      <pre className="mt-2 overflow-x-auto text-slate-700">
        {lines.map((l, i) => `${String(first + i).padStart(3)}  ${l}`).join('\n')}
      </pre>
    </details>
  );
}

const TEST_START_HELP =
  'Seconds after the first reading, or as written in the field: a time of day (14:32:05) for a record with dates and times, an elapsed time (1:30, 90 s) otherwise. Suggested from the shape of the record: where the level leaves its pre-test level.';
/** A level in metres of water in the chosen unit: a length, or the water's pressure ρ g h. */
function levelFromSi(m: number, unit: string, densityKgM3: number): number {
  return isPressureUnit(unit) ? pressureFromSi(m * densityKgM3 * STANDARD_GRAVITY, unit, densityKgM3) : lengthFromSi(m, unit as LengthUnit);
}

/** A bare number is seconds after the first reading; anything else is sent as typed for the server to read. */
const isPlainNumber = (text: string) => /^\s*[+-]?(\d+([.,]\d*)?|[.,]\d+)\s*$/.test(text);

/**
 * Logger upload: choose the file (and a barometric file for an absolute sensor), confirm or change
 * what Kfield read from it (layout, columns, units, time zone, reference), check the test start and
 * static level suggested from the data, then upload with progress.
 */
export function LoggerUploadForm({
  wellId,
  defaultUnit,
  onUploaded,
  onCancel,
}: {
  wellId: string;
  defaultUnit: LengthUnit;
  onUploaded: (record: RecordDto) => void;
  onCancel: () => void;
}) {
  const id = useId();
  const zones = useMemo(allZones, []);
  const [file, setFile] = useState<File | null>(null);
  const [barometric, setBarometric] = useState<File | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [previewError, setPreviewError] = useState<string | null>(null);
  const [loading, setLoading] = useState(false);
  const [main, setMain] = useState<FileChoice | null>(null);
  const [baro, setBaro] = useState<FileChoice | null>(null);
  const [reference, setReference] = useState<ReferenceMode>('vented');
  const [clockOffset, setClockOffset] = useState('0');
  const [testType, setTestType] = useState<RecordTestType>('slug-out');
  const [testStart, setTestStart] = useState('');
  const [staticLevel, setStaticLevel] = useState('');
  const [chosenStaticUnit, setStaticUnit] = useState<string>(defaultUnit);
  const [density, setDensity] = useState('1000');
  // A depth below the measuring point is a length: a pressure unit chosen for another reference falls back.
  const staticUnit = reference === 'depth' && isPressureUnit(chosenStaticUnit) ? defaultUnit : chosenStaticUnit;
  const densityKgM3 = numberOrUndefined(density) ?? 1000;
  const [slugVolume, setSlugVolume] = useState('');
  const [slugUnit, setSlugUnit] = useState<VolumeUnit>('L');
  const [testDate, setTestDate] = useState('');
  const [fieldCrew, setFieldCrew] = useState('');
  const [notes, setNotes] = useState('');
  const [edited, setEdited] = useState({ testStart: false, staticLevel: false, testDate: false });
  const [progress, setProgress] = useState<number | null>(null);
  const [uploadError, setUploadError] = useState<{ message: string; fields: [string, string][] } | null>(null);
  const request = useRef(0);

  /** Asks the server to read the files with the choices so far; fills what the user has not set. */
  async function runPreview(settings: PreviewSettings, fresh: boolean, files = { file, barometric }) {
    if (!files.file) return;
    const ticket = ++request.current;
    setLoading(true);
    setPreviewError(null);
    try {
      const p = await previewLoggerFiles({ file: files.file, barometric: files.barometric }, settings);
      if (ticket !== request.current) return;
      setPreview(p);
      const zone = main?.mapping?.time.timeZone ?? browserZone();
      if (fresh || !main) {
        setMain(choiceOf(p.file, zone));
        if (p.file.reference) setReference(p.file.reference);
      } else {
        setMain((m) => (m ? { ...m, layout: p.file.layout, mapping: m.mapping ?? p.file.mapping, valueUnit: m.valueUnit ?? p.file.valueUnit } : m));
      }
      if (p.barometric) setBaro((b) => (b && !fresh ? b : choiceOf(p.barometric!, browserZone())));
      const s = p.suggestion;
      if (s) {
        if (!edited.testStart || fresh) setTestStart(String(Number(s.testStartSeconds.toPrecision(10))));
        if ((!edited.staticLevel || fresh) && s.staticLevelM !== null) setStaticLevel(levelFromSi(s.staticLevelM, staticUnit, densityKgM3).toFixed(3));
        if ((!edited.testDate || fresh) && s.testDate) setTestDate(s.testDate);
        if (s.direction === 'falling-head' && testType !== 'slug-in' && !edited.testStart) setTestType('slug-in');
      }
    } catch (e) {
      if (ticket !== request.current) return;
      setPreviewError(describeError(e));
      if (fresh) setPreview(null);
    } finally {
      if (ticket === request.current) setLoading(false);
    }
  }

  const settingsForPreview = (m: FileChoice | null, b: FileChoice | null, ref: ReferenceMode): PreviewSettings => ({
    ...(m ? { layout: m.layout, ...(m.mapping ? { mapping: m.mapping } : {}), ...(m.valueUnit ? { valueUnit: m.valueUnit } : {}) } : {}),
    reference: ref,
    ...(numberOrUndefined(density) !== undefined ? { waterDensityKgM3: numberOrUndefined(density) } : {}),
    ...(b
      ? {
          barometric: {
            layout: b.layout,
            ...(b.mapping ? { mapping: b.mapping } : {}),
            ...(b.valueUnit ? { valueUnit: b.valueUnit } : {}),
            ...(numberOrUndefined(clockOffset) !== undefined ? { clockOffsetSeconds: numberOrUndefined(clockOffset) } : {}),
          },
        }
      : {}),
  });

  // Re-read the files a moment after the user changes how they are read.
  const settingsKey = JSON.stringify([main, baro, reference, clockOffset, density]);
  const lastKey = useRef('');
  useEffect(() => {
    if (!file || !preview) return;
    if (lastKey.current === '') {
      lastKey.current = settingsKey;
      return;
    }
    if (lastKey.current === settingsKey) return;
    lastKey.current = settingsKey;
    const timer = window.setTimeout(() => void runPreview(settingsForPreview(main, baro, reference), false), 400);
    return () => window.clearTimeout(timer);
    // runPreview reads the latest state through the values in the key.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [settingsKey]);

  const chooseFile = (f: File | null) => {
    setFile(f);
    setPreview(null);
    setMain(null);
    setBaro(null);
    setUploadError(null);
    lastKey.current = '';
    setEdited({ testStart: false, staticLevel: false, testDate: false });
    if (f) void runPreview({}, true, { file: f, barometric });
  };
  const chooseBarometric = (f: File | null) => {
    setBarometric(f);
    setBaro(null);
    lastKey.current = '';
    if (file) void runPreview(main ? { ...settingsForPreview(main, null, f ? 'absolute' : reference) } : {}, !main, { file, barometric: f });
    if (f) setReference('absolute');
  };

  const unitOptions = reference === 'depth' ? LENGTH_UNITS : reference === 'absolute' ? PRESSURE_UNITS : [...LENGTH_UNITS, ...PRESSURE_UNITS];
  const blocking =
    !preview ||
    !main?.mapping ||
    !main.valueUnit ||
    preview.file.problems.length > 0 ||
    (reference === 'absolute' && (!barometric || !baro?.mapping || !baro.valueUnit || (preview.barometric?.problems.length ?? 0) > 0));

  async function upload() {
    if (!file || !main?.mapping || !main.valueUnit) return;
    setUploadError(null);
    const start = numberOrUndefined(testStart);
    const level = numberOrUndefined(staticLevel);
    const slug = numberOrUndefined(slugVolume);
    const settings: LoggerSettingsInput = {
      testType,
      reference,
      layout: main.layout,
      mapping: main.mapping,
      valueUnit: main.valueUnit,
      waterDensityKgM3: numberOrUndefined(density) ?? 1000,
      // Suggested values left as they were are not sent: the server finds the same and says so ("detected", "pre-test").
      ...(edited.testStart && testStart.trim() !== ''
        ? isPlainNumber(testStart) && start !== undefined
          ? { testStartSeconds: start }
          : { testStartText: testStart.trim() }
        : {}),
      ...(level !== undefined && edited.staticLevel ? { staticLevel: { value: level, unit: staticUnit } } : {}),
      ...(slug !== undefined ? { slugVolume: { value: slug, unit: slugUnit } } : {}),
      ...(testDate ? { testDate } : {}),
      fieldCrew,
      notes,
      ...(reference === 'absolute' && baro?.mapping && baro.valueUnit
        ? { barometric: { layout: baro.layout, mapping: baro.mapping, valueUnit: baro.valueUnit, clockOffsetSeconds: numberOrUndefined(clockOffset) ?? 0 } }
        : {}),
    };
    setProgress(0);
    try {
      const record = await uploadLoggerRecord(wellId, { file, barometric: reference === 'absolute' ? barometric : null }, settings, setProgress);
      setProgress(1);
      onUploaded(record);
    } catch (e) {
      setProgress(null);
      const fields = isApiError(e) && e.fields ? Object.entries(e.fields).filter(([k]) => !/^(file|barometric)$/.test(k)) : [];
      setUploadError({ message: describeError(e), fields: fields.slice(0, 10) });
    }
  }

  const suggestion = preview?.suggestion ?? null;
  const levelLabel = reference === 'depth' ? 'Static level, depth below the measuring point' : 'Static level, head above the sensor';
  return (
    <div className="space-y-6">
      <section aria-labelledby={`${id}-files`} className="space-y-3">
        <h3 id={`${id}-files`} className="text-sm font-semibold text-slate-900">
          1. Files
        </h3>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            id={`${id}-file`}
            label="Logger file (CSV or text export)"
            type="file"
            accept=".csv,.txt,.dat,.tsv,text/csv,text/plain"
            onChange={(e) => chooseFile(e.target.files?.[0] ?? null)}
          />
          <TextField
            id={`${id}-baro`}
            label="Barometric file (for an absolute sensor)"
            type="file"
            accept=".csv,.txt,.dat,.tsv,text/csv,text/plain"
            hint="A barometer logged on the site, on its own clock and interval."
            onChange={(e) => chooseBarometric(e.target.files?.[0] ?? null)}
          />
        </div>
        {loading ? (
          <p className="flex items-center gap-2 text-sm text-slate-600" role="status">
            <Spinner /> Reading the file…
          </p>
        ) : null}
        {previewError ? <Alert tone="error" title="The file could not be read">{previewError}</Alert> : null}
      </section>

      {preview && main ? (
        <>
          <section aria-labelledby={`${id}-layout`} className="space-y-3">
            <h3 id={`${id}-layout`} className="text-sm font-semibold text-slate-900">
              2. Layout and columns of the logger file
            </h3>
            <FileSummary preview={preview.file} />
            <Preamble lines={preview.file.preamble} first={1} />
            <FileLayoutFields idPrefix={`${id}-main`} layout={main.layout} onChange={(layout) => setMain({ ...main, layout })} />
            {main.mapping ? (
              <MappingFields
                idPrefix={`${id}-main`}
                columns={preview.file.columns}
                mapping={main.mapping}
                zones={zones}
                valueLabel="Value column (level or pressure)"
                onChange={(mapping) => setMain({ ...main, mapping })}
              />
            ) : (
              <Button variant="secondary" size="sm" onClick={() => setMain({ ...main, mapping: { time: { columns: [0], format: 's', timeZone: browserZone() }, valueColumn: Math.min(1, preview.file.columns.length - 1) } })}>
                Choose the columns by hand
              </Button>
            )}
            <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
              <SelectField id={`${id}-reference`} label="The value column measures" value={reference} onChange={(e) => setReference(e.target.value as ReferenceMode)}>
                {REFERENCE_MODES.map((m) => (
                  <option key={m.id} value={m.id}>
                    {REFERENCE_SHORT[m.id]}
                  </option>
                ))}
              </SelectField>
              <SelectField id={`${id}-unit`} label="Unit of the value column" value={main.valueUnit ?? ''} onChange={(e) => setMain({ ...main, valueUnit: e.target.value || null })}>
                <option value="">choose…</option>
                {unitOptions.map((u) => (
                  <option key={u.id} value={u.id}>
                    {u.label}
                  </option>
                ))}
              </SelectField>
            </div>
            <Notes notes={preview.file.notes} />
            <PreviewTable preview={preview.file} mapping={main.mapping} caption="First readings of the logger file" />
            <Problems preview={preview.file} what="The logger file" />
          </section>

          {reference === 'absolute' ? (
            <section aria-labelledby={`${id}-baro-title`} className="space-y-3">
              <h3 id={`${id}-baro-title`} className="text-sm font-semibold text-slate-900">
                3. Barometric file
              </h3>
              {!barometric || !preview.barometric || !baro ? (
                <Alert tone="warning">An absolute (non-vented) sensor reads water and air pressure together: choose the barometric file above.</Alert>
              ) : (
                <>
                  <FileSummary preview={preview.barometric} />
                  <FileLayoutFields idPrefix={`${id}-baro`} layout={baro.layout} onChange={(layout) => setBaro({ ...baro, layout })} />
                  {baro.mapping ? (
                    <MappingFields
                      idPrefix={`${id}-baro`}
                      columns={preview.barometric.columns}
                      mapping={baro.mapping}
                      zones={zones}
                      valueLabel="Pressure column"
                      onChange={(mapping) => setBaro({ ...baro, mapping })}
                    />
                  ) : null}
                  <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
                    <SelectField id={`${id}-baro-unit`} label="Unit of the pressure column" value={baro.valueUnit ?? ''} onChange={(e) => setBaro({ ...baro, valueUnit: e.target.value || null })}>
                      <option value="">choose…</option>
                      {PRESSURE_UNITS.map((u) => (
                        <option key={u.id} value={u.id}>
                          {u.label}
                        </option>
                      ))}
                    </SelectField>
                    <TextField
                      id={`${id}-offset`}
                      label="Barometer clock offset (s)"
                      inputMode="decimal"
                      value={clockOffset}
                      hint="Added to the barometer’s times when its clock was off."
                      onChange={(e) => setClockOffset(e.target.value)}
                    />
                  </div>
                  <Notes notes={preview.barometric.notes.filter((n) => !/absolute pressure/.test(n))} />
                  <PreviewTable preview={preview.barometric} mapping={baro.mapping} caption="First readings of the barometric file" />
                  <Problems preview={preview.barometric} what="The barometric file" />
                </>
              )}
            </section>
          ) : null}

          <section aria-labelledby={`${id}-test`} className="space-y-3">
            <h3 id={`${id}-test`} className="text-sm font-semibold text-slate-900">
              {reference === 'absolute' ? '4.' : '3.'} The test
            </h3>
            {preview.curve ? <PreviewCurve curve={preview.curve} reference={reference} markers={startMarkers(preview, testStart, Boolean(edited.testStart))} typedStart={edited.testStart && !Number.isFinite(Number(testStart.trim().replace(',', '.'))) ? testStart.trim() : null} /> : null}
            {suggestion ? (
              <p className="text-sm text-slate-700" data-testid="suggestion">
                Detected from the data, not entered: the test starts {formatDuration(suggestion.testStartSeconds)} after the first reading
                {suggestion.startedAt ? ` (${new Date(suggestion.startedAt).toISOString().replace('T', ' ').slice(0, 19)} UTC)` : ''}, H0 ={' '}
                {levelFromSi(Math.abs(suggestion.h0M), staticUnit, densityKgM3).toFixed(3)} {staticUnit}, {suggestion.direction}
                {suggestion.staticSource === 'pre-test' ? '; static level detected from the readings before the start' : ''}. Enter either to
                use your own.
              </p>
            ) : preview.suggestionProblem ? (
              <Alert tone="warning">
                <p>{preview.suggestionProblem}</p>
                {preview.testStartCandidates?.length ? (
                  <p className="mt-2 flex flex-wrap items-center gap-2" data-testid="start-candidates">
                    <span>Where the level changes most:</span>
                    {preview.testStartCandidates.map((c) => (
                      <Button
                        key={c}
                        variant="secondary"
                        size="sm"
                        onClick={() => {
                          setTestStart(String(Number(c.toPrecision(6))));
                          setEdited((x) => ({ ...x, testStart: true }));
                        }}
                      >
                        Start at {formatDuration(c)}
                      </Button>
                    ))}
                  </p>
                ) : null}
              </Alert>
            ) : null}
            <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
              <SelectField id={`${id}-type`} label="Test type" value={testType} onChange={(e) => setTestType(e.target.value as RecordTestType)}>
                {RECORD_TEST_TYPES.map((t) => (
                  <option key={t} value={t}>
                    {RECORD_TEST_TYPE_LABELS[t]}
                  </option>
                ))}
              </SelectField>
              <TextField
                id={`${id}-start`}
                label="Test start (s after the first reading, or a time)"
                value={testStart}
                hint={TEST_START_HELP}
                onChange={(e) => {
                  setTestStart(e.target.value);
                  setEdited((x) => ({ ...x, testStart: true }));
                }}
              />
              <div className="grid grid-cols-[1fr_6rem] items-start gap-2">
                <TextField
                  id={`${id}-static`}
                  label={levelLabel}
                  inputMode="decimal"
                  value={staticLevel}
                  hint="Empty: the mean of the readings before the test start."
                  onChange={(e) => {
                    setStaticLevel(e.target.value);
                    setEdited((x) => ({ ...x, staticLevel: true }));
                  }}
                />
                <SelectField id={`${id}-static-unit`} label="Unit" value={staticUnit} onChange={(e) => setStaticUnit(e.target.value)}>
                  {LENGTH_UNITS.map((u) => (
                    <option key={u.id} value={u.id}>
                      {u.label}
                    </option>
                  ))}
                  {reference !== 'depth'
                    ? PRESSURE_UNITS.map((u) => (
                        <option key={u.id} value={u.id}>
                          {u.label} (water pressure above the sensor, with the density)
                        </option>
                      ))
                    : null}
                </SelectField>
              </div>
              <TextField
                id={`${id}-date`}
                label="Test date"
                type="date"
                value={testDate}
                onChange={(e) => {
                  setTestDate(e.target.value);
                  setEdited((x) => ({ ...x, testDate: true }));
                }}
              />
              <TextField id={`${id}-density`} label="Water density (kg/m³)" inputMode="decimal" value={density} hint="For pressure to head; 1000 unless the water is saline or warm." onChange={(e) => setDensity(e.target.value)} />
              <div className="grid grid-cols-[1fr_6rem] items-start gap-2">
                <TextField id={`${id}-slug`} label="Slug volume (optional)" inputMode="decimal" value={slugVolume} hint="For the expected H0." onChange={(e) => setSlugVolume(e.target.value)} />
                <SelectField id={`${id}-slug-unit`} label="Unit" value={slugUnit} onChange={(e) => setSlugUnit(e.target.value as VolumeUnit)}>
                  {VOLUME_UNITS.map((u) => (
                    <option key={u.id} value={u.id}>
                      {u.label}
                    </option>
                  ))}
                </SelectField>
              </div>
              <TextField id={`${id}-crew`} label="Field crew" value={fieldCrew} autoComplete="off" onChange={(e) => setFieldCrew(e.target.value)} />
              <TextAreaField id={`${id}-notes`} label="Notes" className="sm:col-span-2" value={notes} onChange={(e) => setNotes(e.target.value)} />
            </div>
          </section>

          {uploadError ? (
            <Alert tone="error" title="The record was not saved">
              <p>{uploadError.message}</p>
              {uploadError.fields.length > 1 ? (
                <ul className="mt-1 list-disc pl-5">
                  {uploadError.fields.map(([k, v]) => (
                    <li key={k}>
                      {k.replace(/^file\.lines\./, 'line ')}: {v}
                    </li>
                  ))}
                </ul>
              ) : null}
            </Alert>
          ) : null}
          {progress !== null ? (
            <div className="space-y-1" role="group" aria-label="Upload progress">
              <div
                className="h-2 overflow-hidden rounded bg-slate-200"
                role="progressbar"
                aria-label="Uploading the files"
                aria-valuemin={0}
                aria-valuemax={100}
                aria-valuenow={Math.round(progress * 100)}
              >
                <div className="h-full bg-accent-600 transition-[width]" style={{ width: `${Math.round(progress * 100)}%` }} />
              </div>
              <p className="text-xs text-slate-600">
                {progress < 1 ? `Uploading ${Math.round(progress * 100)} % of ${formatBytes((file?.size ?? 0) + (reference === 'absolute' ? (barometric?.size ?? 0) : 0))}…` : 'Reading, reducing and storing the record…'}
              </p>
            </div>
          ) : null}
          <div className="flex flex-wrap gap-2">
            <Button onClick={() => void upload()} disabled={blocking || loading} pending={progress !== null}>
              Upload and save the record
            </Button>
            <Button variant="ghost" onClick={onCancel}>
              Cancel
            </Button>
          </div>
        </>
      ) : null}
    </div>
  );
}

/** The starts drawn on the preview's curve: the one the user typed (in seconds), else the detected one, else the candidates. */
function startMarkers(preview: Preview, testStart: string, typedByUser: boolean): CurveMarker[] {
  const typed = Number(testStart.trim().replace(',', '.'));
  if (typedByUser && testStart.trim() !== '') return Number.isFinite(typed) ? [{ seconds: typed, label: 'entered start', kind: 'entered' }] : [];
  if (preview.suggestion) return [{ seconds: preview.suggestion.testStartSeconds, label: 'detected start', kind: 'detected' }];
  return (preview.testStartCandidates ?? []).map((c, i) => ({ seconds: c, label: `candidate ${i + 1}`, kind: 'candidate' }));
}
