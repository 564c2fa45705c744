import { useId, useMemo, useState, type ReactNode } from 'react';
import { useMutation } from '@tanstack/react-query';
import { DELIMITER_LABELS, DELIMITERS, readDelimitedTable, type Delimiter, type DelimitedTable } from '@shared/csv/read-table';
import type { Site } from '@shared/schemas/sites';
import {
  IMPORT_FIELD_GROUP,
  IMPORT_FIELD_LABELS,
  IMPORT_FIELDS,
  guessMapping,
  guessUnit,
  requiredImportFields,
  type ImportField,
  type ImportReport,
  type WellImportBody,
} from '@shared/schemas/well-import';
import { LENGTH_GROUPS, LENGTH_GROUP_LABELS, LENGTH_UNIT_IDS, displayLengthUnit, type LengthGroup, type ScreenReference } from '@shared/schemas/wells';
import type { LengthUnit } from '@shared/units/length';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { InlineSelect, SelectField, TextField } from '@/components/ui/field';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { plural } from '@/lib/format';
import { importWells } from '../api';

type ImportSite = Pick<Site, 'id' | 'epsgCode' | 'crsName' | 'displayUnits'>;
type CoordinateChoice = 'site' | 'latlon' | 'other';

/** The JSON body the server takes is bounded at 1 MB; a wells table is far smaller. */
const MAX_FILE_BYTES = 1_000_000;
const PREVIEW_ROWS = 5;

/** UTF-8, or Windows-1252 as many spreadsheets save "CSV" (the server reads uploads the same way). */
function decode(buffer: ArrayBuffer): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(buffer);
  } catch {
    return new TextDecoder('windows-1252').decode(buffer);
  }
}

function Step({ n, title, description, children, titleId }: { n: number; title: string; description?: ReactNode; children: ReactNode; titleId: string }) {
  return (
    <Card aria-labelledby={titleId}>
      <CardHeader titleId={titleId} title={`${n}. ${title}`} description={description} />
      <CardBody>{children}</CardBody>
    </Card>
  );
}

export function ImportWizard({ site, onImported, renderCrsStatus }: { site: ImportSite; onImported: (report: ImportReport) => void; renderCrsStatus?: (id: string, value: unknown) => ReactNode }) {
  const ids = useId();
  const crsStatusId = `${ids}-crs`;
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [delimiter, setDelimiter] = useState<Delimiter | undefined>(undefined);
  const [mapping, setMapping] = useState<Partial<Record<ImportField, string>>>({});
  const [choice, setChoice] = useState<CoordinateChoice>('site');
  const [otherEpsg, setOtherEpsg] = useState('');
  const [screenReference, setScreenReference] = useState<ScreenReference>('depth');
  const [units, setUnits] = useState<Record<LengthGroup, LengthUnit>>({
    elevation: displayLengthUnit(site.displayUnits, 'elevation'),
    depth: displayLengthUnit(site.displayUnits, 'depth'),
    radius: displayLengthUnit(site.displayUnits, 'radius'),
  });
  const [checked, setChecked] = useState<{ key: string; report: ImportReport } | null>(null);

  const parsed = useMemo((): { table: DelimitedTable } | { error: string } | null => {
    if (!file) return null;
    try {
      return { table: readDelimitedTable(file.text, delimiter) };
    } catch (e) {
      return { error: describeError(e) };
    }
  }, [file, delimiter]);
  const table = parsed && 'table' in parsed ? parsed.table : null;

  const coordinateKind = choice === 'latlon' ? 'latlon' : 'epsg';
  const body = useMemo((): WellImportBody | null => {
    if (!file || !table) return null;
    const relevant = Object.fromEntries(
      Object.entries(mapping).filter(([f, col]) => col && (coordinateKind === 'latlon' ? f !== 'x' && f !== 'y' : f !== 'lat' && f !== 'lon')),
    );
    return {
      csv: file.text,
      delimiter: table.delimiter as Delimiter,
      mapping: relevant,
      units,
      screenReference,
      coordinates: choice === 'latlon' ? { kind: 'latlon' } : { kind: 'epsg', epsg: choice === 'site' ? site.epsgCode : Number(otherEpsg) },
    };
  }, [file, table, mapping, units, screenReference, choice, otherEpsg, coordinateKind, site.epsgCode]);
  const bodyKey = body ? JSON.stringify({ ...body, csv: body.csv.length }) : '';
  const report = checked && checked.key === bodyKey ? checked.report : null;
  const missing = requiredImportFields(coordinateKind).filter((f) => !mapping[f]);

  const dryRun = useMutation({
    mutationFn: (b: WellImportBody) => importWells(site.id, b, true),
    onSuccess: (r) => setChecked({ key: bodyKey, report: r }),
  });
  const run = useMutation({ mutationFn: (b: WellImportBody) => importWells(site.id, b, false), onSuccess: onImported });

  async function chooseFile(f: File | undefined) {
    setChecked(null);
    setFileError(null);
    setDelimiter(undefined);
    if (!f) return setFile(null);
    if (f.size > MAX_FILE_BYTES) {
      setFile(null);
      return setFileError(`${f.name} is ${(f.size / 1e6).toFixed(1)} MB; a wells file can be at most 1 MB.`);
    }
    const text = decode(await f.arrayBuffer());
    setFile({ name: f.name, text });
    try {
      const t = readDelimitedTable(text);
      const latlon = guessMapping(t.header, 'latlon');
      const xy = guessMapping(t.header, 'epsg');
      const kind: CoordinateChoice = latlon.lat && latlon.lon && !(xy.x && xy.y) ? 'latlon' : 'site';
      const screen: ScreenReference = t.header.some((h) => /screen.*elev/i.test(h)) && !t.header.some((h) => /screen.*(depth|bgs)/i.test(h)) ? 'elevation' : 'depth';
      const guessed = { ...guessMapping(t.header, 'epsg', screen), ...guessMapping(t.header, 'latlon', screen) };
      setChoice(kind);
      setScreenReference(screen);
      setMapping(guessed);
      setUnits((old) => {
        const next = { ...old };
        for (const g of LENGTH_GROUPS) {
          const fields = IMPORT_FIELDS.filter((f) => IMPORT_FIELD_GROUP[f] === g && guessed[f]);
          const hit = fields.map((f) => guessUnit(guessed[f]!)).find(Boolean);
          if (hit) next[g] = hit;
        }
        return next;
      });
    } catch {
      setMapping({});
    }
  }

  const setField = (f: ImportField, col: string) => setMapping((m) => ({ ...m, [f]: col || undefined }));
  const mappedFields = IMPORT_FIELDS.filter((f) => mapping[f] && (coordinateKind === 'latlon' ? f !== 'x' && f !== 'y' : f !== 'lat' && f !== 'lon'));
  const colIndex = (col: string) => table?.header.indexOf(col) ?? -1;
  const serverError = dryRun.error ?? run.error;

  return (
    <div className="space-y-6">
      <Step n={1} titleId={`${ids}-s1`} title="Choose a CSV file" description="One well per row, with a header row naming the columns. Comma, semicolon, tab or vertical-bar separated.">
        <div className="space-y-4">
          <div>
            <label htmlFor={`${ids}-file`} className="block text-sm font-medium text-slate-800">
              Wells file (CSV or TXT)
            </label>
            <input
              id={`${ids}-file`}
              type="file"
              accept=".csv,.txt,text/csv,text/plain"
              onChange={(e) => void chooseFile(e.target.files?.[0])}
              className="mt-1.5 block w-full text-sm text-slate-700 file:mr-3 file:rounded-md file:border-0 file:bg-accent-700 file:px-3 file:py-2 file:text-sm file:font-medium file:text-white hover:file:bg-accent-800"
            />
          </div>
          {fileError ? <Alert tone="error">{fileError}</Alert> : null}
          {parsed && 'error' in parsed ? <Alert tone="error" title="The file cannot be read">{parsed.error}</Alert> : null}
          {table && file ? (
            <div className="space-y-3">
              <div className="flex flex-wrap items-end gap-4 text-sm">
                <p className="text-slate-700">
                  <span className="font-medium text-slate-900">{file.name}</span> · {plural(table.records.length + table.problems.length, 'row', 'rows')} below the header
                </p>
                <div className="flex items-center gap-2">
                  <span className="text-slate-600" aria-hidden="true">Separated by</span>
                  <InlineSelect label="Column delimiter" value={table.delimiter} onChange={(e) => setDelimiter(e.target.value as Delimiter)}>
                    {DELIMITERS.map((d) => (
                      <option key={d} value={d}>
                        {DELIMITER_LABELS[d]}
                        {d === table.delimiter && !delimiter ? ' (detected)' : ''}
                      </option>
                    ))}
                  </InlineSelect>
                </div>
              </div>
              <div>
                <p className="text-xs font-medium text-slate-600">Header ({table.header.length} columns)</p>
                <ul className="mt-1 flex flex-wrap gap-1.5" aria-label="Columns in the header">
                  {table.header.map((h, i) => (
                    <li key={`${h}-${i}`} className="rounded bg-slate-100 px-2 py-0.5 text-xs text-slate-700">
                      {h || <em>unnamed</em>}
                    </li>
                  ))}
                </ul>
              </div>
              {table.problems.length ? (
                <Alert tone="warning">
                  {plural(table.problems.length, 'line has', 'lines have')} a different number of values from the header (first: line {table.problems[0].line}); the check in step 5 lists them.
                </Alert>
              ) : null}
            </div>
          ) : null}
        </div>
      </Step>

      {table ? (
        <>
          <Step n={2} titleId={`${ids}-s2`} title="Match columns to well fields" description="Prefilled from the column names; check each one. Fields marked * are needed for the coordinates chosen in step 4.">
            <div className="grid gap-x-6 gap-y-3 sm:grid-cols-2 lg:grid-cols-3">
              {IMPORT_FIELDS.map((f) => {
                const required = requiredImportFields(coordinateKind).includes(f);
                const unused = coordinateKind === 'latlon' ? f === 'x' || f === 'y' : f === 'lat' || f === 'lon';
                return (
                  <SelectField
                    key={f}
                    label={`${IMPORT_FIELD_LABELS[f]}${required ? ' *' : ''}`}
                    value={mapping[f] ?? ''}
                    onChange={(e) => setField(f, e.target.value)}
                    hint={unused ? 'Not used with the coordinates chosen in step 4' : undefined}
                    error={serverFieldError(serverError, `mapping.${f}`)}
                  >
                    <option value="">Not in the file</option>
                    {table.header.map((h, i) => (
                      <option key={`${h}-${i}`} value={h}>
                        {h}
                      </option>
                    ))}
                  </SelectField>
                );
              })}
            </div>
          </Step>

          <Step n={3} titleId={`${ids}-s3`} title="Preview" description={`The first ${Math.min(PREVIEW_ROWS, table.records.length)} rows as they will be read.`}>
            {mappedFields.length === 0 ? (
              <p className="text-sm text-slate-600">Match at least one column in step 2.</p>
            ) : (
              <div className="overflow-x-auto">
                <table className="w-full border-collapse text-left text-sm">
                  <caption className="sr-only">Preview of the first rows</caption>
                  <thead>
                    <tr>
                      <th scope="col" className="border-b border-slate-200 bg-slate-50 px-3 py-2 text-xs font-medium text-slate-600">Line</th>
                      {mappedFields.map((f) => (
                        <th key={f} scope="col" className="border-b border-slate-200 bg-slate-50 px-3 py-2 text-xs font-medium whitespace-nowrap text-slate-600">
                          {IMPORT_FIELD_LABELS[f]}
                          {mapping[f]!.toLowerCase() !== IMPORT_FIELD_LABELS[f].toLowerCase() ? <span className="block font-normal text-slate-400">{mapping[f]}</span> : null}
                        </th>
                      ))}
                    </tr>
                  </thead>
                  <tbody>
                    {table.records.slice(0, PREVIEW_ROWS).map((r) => (
                      <tr key={r.line}>
                        <td className="border-b border-slate-100 px-3 py-1.5 text-slate-500 tabular-nums">{r.line}</td>
                        {mappedFields.map((f) => (
                          <td key={f} className="max-w-48 truncate border-b border-slate-100 px-3 py-1.5 whitespace-nowrap text-slate-800">
                            {r.values[colIndex(mapping[f]!)]}
                          </td>
                        ))}
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </Step>

          <Step n={4} titleId={`${ids}-s4`} title="Units and coordinate system">
            <div className="space-y-5">
              <div className="grid gap-4 sm:grid-cols-3">
                {LENGTH_GROUPS.map((g) => (
                  <SelectField key={g} label={LENGTH_GROUP_LABELS[g]} value={units[g]} onChange={(e) => setUnits((u) => ({ ...u, [g]: e.target.value as LengthUnit }))} error={serverFieldError(serverError, `units.${g}`)}>
                    {LENGTH_UNIT_IDS.map((u) => (
                      <option key={u} value={u}>
                        {u}
                      </option>
                    ))}
                  </SelectField>
                ))}
              </div>
              <div className="grid gap-4 sm:grid-cols-2">
                <SelectField label="Screen top and bottom are" value={screenReference} onChange={(e) => setScreenReference(e.target.value as ScreenReference)}>
                  <option value="depth">Depths below ground</option>
                  <option value="elevation">Elevations</option>
                </SelectField>
                <SelectField label="Coordinates in the file" value={choice} onChange={(e) => setChoice(e.target.value as CoordinateChoice)}>
                  <option value="site">Easting/northing in the site's system (EPSG:{site.epsgCode})</option>
                  <option value="latlon">Latitude/longitude (WGS 84)</option>
                  <option value="other">Easting/northing in another EPSG system</option>
                </SelectField>
              </div>
              {choice === 'other' ? (
                <div className="space-y-1.5 sm:max-w-sm">
                  <TextField label="EPSG code of the file's coordinates" inputMode="numeric" value={otherEpsg} onChange={(e) => setOtherEpsg(e.target.value)} aria-describedby={crsStatusId} error={serverFieldError(serverError, 'coordinates.epsg')} />
                  {renderCrsStatus?.(crsStatusId, otherEpsg)}
                </div>
              ) : null}
            </div>
          </Step>

          <Step n={5} titleId={`${ids}-s5`} title="Check, then import" description="The check reads every row and saves nothing. The import saves all rows or none.">
            <div className="space-y-4">
              {missing.length ? (
                <Alert tone="warning">Match a column to {missing.map((f) => IMPORT_FIELD_LABELS[f].toLowerCase()).join(', ')} in step 2.</Alert>
              ) : null}
              <div className="flex flex-wrap gap-3">
                <Button variant="secondary" disabled={!body || missing.length > 0} pending={dryRun.isPending} onClick={() => body && dryRun.mutate(body)}>
                  Check the file
                </Button>
                <Button
                  disabled={!body || !report || report.problems.length > 0}
                  pending={run.isPending}
                  onClick={() => body && run.mutate(body)}
                >
                  {report && report.problems.length === 0 ? `Import ${plural(report.validCount, 'well', 'wells')}` : 'Import'}
                </Button>
              </div>
              {serverError ? <ServerProblems error={serverError} /> : null}
              {report ? <CheckResult report={report} /> : checked ? <p className="text-sm text-slate-600">The settings changed since the last check; check the file again.</p> : null}
            </div>
          </Step>
        </>
      ) : null}
    </div>
  );
}

/** The table has a line column: "Line 4: the name …" → "The name …". */
function withoutLine(message: string): string {
  const rest = message.replace(/^Line \d+:? ?/, '');
  return rest.charAt(0).toUpperCase() + rest.slice(1);
}

function problemFieldLabel(field: string | null): string {
  if (!field) return 'Whole line';
  const top = field.split('.')[0];
  if (top === 'coordinates') return 'Coordinates';
  return IMPORT_FIELD_LABELS[top as ImportField] ?? top;
}

function serverFieldError(error: unknown, field: string): string | undefined {
  return isApiError(error) ? error.fields?.[field] : undefined;
}

function ServerProblems({ error }: { error: unknown }) {
  const fields = isApiError(error) ? Object.values(error.fields ?? {}) : [];
  return (
    <Alert tone="error" title={describeError(error)}>
      {fields.length > 1 ? (
        <ul className="list-disc space-y-0.5 pl-5">
          {fields.slice(0, 20).map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      ) : null}
    </Alert>
  );
}

function CheckResult({ report }: { report: ImportReport }) {
  if (report.problems.length === 0) {
    return (
      <Alert tone="success" title={`All ${plural(report.validCount, 'row is', 'rows are')} ready to import.`}>
        Nothing has been saved yet.
      </Alert>
    );
  }
  return (
    <div className="space-y-2">
      <Alert tone="error" title={`${plural(report.problems.length, 'problem', 'problems')} in ${plural(new Set(report.problems.map((p) => p.line)).size, 'row', 'rows')}`}>
        {report.validCount} of {report.rowCount} rows are ready. Fix the file (or the matching above) and check again; nothing is imported while any row has a problem.
      </Alert>
      <div className="max-h-96 overflow-auto rounded-md ring-1 ring-slate-200">
        <table className="w-full border-collapse text-left text-sm">
          <caption className="sr-only">Problems by line</caption>
          <thead className="sticky top-0">
            <tr>
              <th scope="col" className="bg-slate-50 px-3 py-2 text-xs font-medium text-slate-600">Line</th>
              <th scope="col" className="bg-slate-50 px-3 py-2 text-xs font-medium text-slate-600">Field</th>
              <th scope="col" className="bg-slate-50 px-3 py-2 text-xs font-medium text-slate-600">Problem</th>
            </tr>
          </thead>
          <tbody>
            {report.problems.map((p, i) => (
              <tr key={`${p.line}-${p.field}-${i}`}>
                <td className="border-t border-slate-100 px-3 py-1.5 align-top tabular-nums">{p.line}</td>
                <td className="border-t border-slate-100 px-3 py-1.5 align-top whitespace-nowrap text-slate-600">
                  {problemFieldLabel(p.field)}
                </td>
                <td className="border-t border-slate-100 px-3 py-1.5 text-slate-800">{withoutLine(p.message)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
