import { useState, type ClipboardEvent, type KeyboardEvent } from 'react';
import { useFieldArray, useForm, type Path } from 'react-hook-form';
import { RECORD_TEST_TYPE_LABELS, RECORD_TEST_TYPES, tapeBodySchema, type RecordDto, type RecordTestType, type TapeBodyInput, type TapeTimeFormat } from '@shared/schemas/records';
import { LENGTH_UNITS, type LengthUnit } from '@shared/units/length';
import { VOLUME_UNITS, type VolumeUnit } from '@shared/units/volume';
import { Button } from '@/components/ui/button';
import { FieldError, SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { applyServerErrors } from '@/lib/form-errors';

type Row = { time: string; depth: string };
export type TapeFormValues = {
  testType: RecordTestType;
  timeFormat: TapeTimeFormat;
  units: LengthUnit;
  staticLevel: string;
  testStart: string;
  testDate: string;
  fieldCrew: string;
  notes: string;
  slugVolume: string;
  slugVolumeUnit: VolumeUnit;
  rows: Row[];
};

const TIME_FORMATS: { id: TapeTimeFormat; label: string; placeholder: string }[] = [
  { id: 's', label: 'Seconds', placeholder: '0, 15, 30…' },
  { id: 'min', label: 'Minutes', placeholder: '0, 0.25, 0.5…' },
  { id: 'mm:ss', label: 'mm:ss', placeholder: '0:00, 0:15…' },
];

const EMPTY_ROWS = 12;
const emptyRows = (n: number): Row[] => Array.from({ length: n }, () => ({ time: '', depth: '' }));

/** A number typed with a point or a decimal comma; undefined when empty. */
function numberOrUndefined(text: string): number | undefined {
  const t = text.trim();
  return t === '' ? undefined : Number(t.replace(',', '.'));
}

/**
 * Splits text pasted from a spreadsheet into cells: rows by line, cells by tab (or by a semicolon
 * or comma when there is no tab). A first row whose depth is not a number is a header and is dropped.
 */
export function pastedCells(text: string): string[][] {
  const lines = text.replace(/\r\n?/g, '\n').split('\n').filter((l) => l.trim() !== '');
  const sep = lines.some((l) => l.includes('\t')) ? '\t' : lines.some((l) => l.includes(';')) ? ';' : lines.some((l) => /\d,\d+[ ,]*$/.test(l) && l.split(',').length > 2) ? ',' : '\t';
  const rows = lines.map((l) => l.split(sep).map((c) => c.trim()));
  if (rows.length > 0 && rows[0].length > 1 && !Number.isFinite(Number(rows[0][rows[0].length - 1].replace(',', '.')))) rows.shift();
  return rows;
}

/**
 * The typed tape readings as the API's body, with a map from the body's reading index back to the
 * grid row (empty rows are left out), so a server message about readings.3 lands on its row.
 */
export function tapeBody(v: TapeFormValues): { body: TapeBodyInput; rowOf: number[] } {
  const rowOf: number[] = [];
  const readings: TapeBodyInput['readings'] = [];
  v.rows.forEach((r, i) => {
    if (r.time.trim() === '' && r.depth.trim() === '') return;
    rowOf.push(i);
    const depth = numberOrUndefined(r.depth);
    readings.push({ time: v.timeFormat === 'mm:ss' ? r.time.trim() : (numberOrUndefined(r.time) ?? Number.NaN), depth: depth ?? Number.NaN });
  });
  const staticLevel = numberOrUndefined(v.staticLevel);
  const slug = numberOrUndefined(v.slugVolume);
  // A bare number is in the readings' time format; text such as 1:30 or 90 s is sent as typed for the server to read.
  const startText = v.testStart.trim();
  const testStart = startText === '' ? undefined : v.timeFormat !== 'mm:ss' && /^[+-]?(\d+([.,]\d*)?|[.,]\d+)$/.test(startText) ? numberOrUndefined(startText) : startText;
  return {
    rowOf,
    body: {
      testType: v.testType,
      readings,
      timeFormat: v.timeFormat,
      units: v.units,
      ...(staticLevel !== undefined ? { static: staticLevel } : {}),
      ...(testStart !== undefined ? { testStart } : {}),
      ...(v.testDate ? { testDate: v.testDate } : {}),
      fieldCrew: v.fieldCrew,
      notes: v.notes,
      ...(slug !== undefined ? { slugVolume: { value: slug, unit: v.slugVolumeUnit } } : {}),
    },
  };
}

/** A server or schema field of the body → the form's path. */
function formPath(field: string, rowOf: number[]): Path<TapeFormValues> | null {
  const reading = /^readings\.(\d+)\.(time|depth)$/.exec(field);
  if (reading) {
    const row = rowOf[Number(reading[1])];
    return row === undefined ? null : (`rows.${row}.${reading[2]}` as Path<TapeFormValues>);
  }
  const top: Record<string, Path<TapeFormValues>> = {
    static: 'staticLevel',
    testStart: 'testStart',
    testDate: 'testDate',
    testType: 'testType',
    units: 'units',
    timeFormat: 'timeFormat',
    fieldCrew: 'fieldCrew',
    notes: 'notes',
    'slugVolume.value': 'slugVolume',
    slugVolume: 'slugVolume',
  };
  return top[field] ?? null;
}

const cellClass =
  'block w-full rounded-md border-0 bg-white px-2 py-1.5 text-sm tabular-nums text-slate-900 ring-1 ring-inset ring-slate-300 ' +
  'focus-visible:outline-2 focus-visible:outline-accent-600 aria-[invalid=true]:ring-red-400';

/**
 * Tape readings of one test typed into a grid: time since the test start (s, min or mm:ss) and
 * depth to water below the measuring point. A block pasted from a spreadsheet (time and depth
 * columns, tab-separated) fills rows from the cell it is pasted into.
 */
export function TapeReadingsForm({
  defaultUnit,
  onSubmit,
  onCancel,
}: {
  defaultUnit: LengthUnit;
  onSubmit: (body: TapeBodyInput) => Promise<RecordDto>;
  onCancel: () => void;
}) {
  const form = useForm<TapeFormValues>({
    defaultValues: {
      testType: 'bail-down',
      timeFormat: 'mm:ss',
      units: defaultUnit,
      staticLevel: '',
      testStart: '',
      testDate: '',
      fieldCrew: '',
      notes: '',
      slugVolume: '',
      slugVolumeUnit: 'L',
      rows: emptyRows(EMPTY_ROWS),
    },
  });
  const { register, handleSubmit, setError, setValue, getValues, watch, formState } = form;
  const rows = useFieldArray({ control: form.control, name: 'rows' });
  const timeFormat = watch('timeFormat');
  const units = watch('units');
  const [pasted, setPasted] = useState<string | null>(null);
  const errors = formState.errors;

  const submit = handleSubmit(async (values) => {
    const { body, rowOf } = tapeBody(values);
    const checked = tapeBodySchema.safeParse(body);
    if (!checked.success) {
      let placed = false;
      for (const issue of checked.error.issues) {
        const path = formPath(issue.path.join('.'), rowOf);
        if (path) {
          setError(path, { type: 'schema', message: issue.message }, { shouldFocus: !placed });
          placed = true;
        } else {
          setError('root.server', { type: 'schema', message: issue.message });
        }
      }
      return;
    }
    try {
      await onSubmit(body);
    } catch (error) {
      applyServerErrors(error, setError, (field) => formPath(field, rowOf));
    }
  });

  const onPaste = (row: number, column: 'time' | 'depth') => (e: ClipboardEvent<HTMLInputElement>) => {
    const text = e.clipboardData.getData('text/plain');
    if (!/[\t\n]/.test(text)) return;
    e.preventDefault();
    const cells = pastedCells(text);
    const current = getValues('rows');
    const needed = row + cells.length;
    if (needed > current.length) rows.append(emptyRows(needed - current.length), { shouldFocus: false });
    cells.forEach((c, k) => {
      if (c.length >= 2 || column === 'time') setValue(`rows.${row + k}.time`, c[0] ?? '');
      if (c.length >= 2) setValue(`rows.${row + k}.depth`, c[1] ?? '');
      else if (column === 'depth') setValue(`rows.${row + k}.depth`, c[0] ?? '');
    });
    setPasted(`Pasted ${cells.length} ${cells.length === 1 ? 'row' : 'rows'} from row ${row + 1}.`);
  };

  const onKeyDown = (row: number, column: 'time' | 'depth') => (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key !== 'Enter') return;
    e.preventDefault();
    if (row + 1 >= getValues('rows').length) rows.append(emptyRows(1), { shouldFocus: false });
    requestAnimationFrame(() => form.setFocus(`rows.${row + 1}.${column}`));
  };

  const format = TIME_FORMATS.find((f) => f.id === timeFormat) ?? TIME_FORMATS[2];
  return (
    <form onSubmit={submit} noValidate className="space-y-6">
      <div className="grid gap-4 sm:grid-cols-3">
        <SelectField label="Test type" {...register('testType')}>
          {RECORD_TEST_TYPES.map((t) => (
            <option key={t} value={t}>
              {RECORD_TEST_TYPE_LABELS[t]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Time written as" {...register('timeFormat')}>
          {TIME_FORMATS.map((f) => (
            <option key={f.id} value={f.id}>
              {f.label}
            </option>
          ))}
        </SelectField>
        <SelectField label="Depth unit" {...register('units')}>
          {LENGTH_UNITS.map((u) => (
            <option key={u.id} value={u.id}>
              {u.label}
            </option>
          ))}
        </SelectField>
        <TextField
          label={`Static water level (depth below MP, ${units})`}
          inputMode="decimal"
          hint="Leave empty to use the mean of the readings before the test start."
          error={errors.staticLevel?.message}
          {...register('staticLevel')}
        />
        <TextField
          label={`Test start (${format.label.toLowerCase()})`}
          inputMode="text"
          hint="Or as written at the well: 1:30, 90 s, 1.5 min. Leave empty to start at the largest step between readings."
          error={errors.testStart?.message}
          {...register('testStart')}
        />
        <TextField label="Test date" type="date" error={errors.testDate?.message} {...register('testDate')} />
      </div>

      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-slate-800">Readings</legend>
        <p className="text-xs text-slate-600">
          Time since the test start and depth to water below the measuring point. Paste two columns from a spreadsheet into any cell to fill the rows
          from there; Enter moves down.
        </p>
        <div className="max-h-[28rem] max-w-2xl overflow-y-auto rounded-md ring-1 ring-slate-200">
          <table className="w-full border-collapse text-sm">
            <caption className="sr-only">Tape readings</caption>
            <thead className="sticky top-0 bg-slate-50">
              <tr>
                <th scope="col" className="w-12 px-2 py-2 text-right text-xs font-medium text-slate-600">
                  #
                </th>
                <th scope="col" className="px-2 py-2 text-left text-xs font-medium text-slate-600">
                  Time ({format.label.toLowerCase()})
                </th>
                <th scope="col" className="px-2 py-2 text-left text-xs font-medium text-slate-600">
                  Depth to water ({units})
                </th>
                <th scope="col" className="w-10">
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {rows.fields.map((field, i) => {
                const timeError = errors.rows?.[i]?.time?.message;
                const depthError = errors.rows?.[i]?.depth?.message;
                return (
                  <tr key={field.id} className="border-t border-slate-100 align-top">
                    <td className="px-2 pt-3 text-right text-xs leading-none text-slate-500 tabular-nums">{i + 1}</td>
                    <td className="px-2 py-1">
                      <input
                        aria-label={`Time of reading ${i + 1}`}
                        placeholder={i === 0 ? format.placeholder : undefined}
                        inputMode={timeFormat === 'mm:ss' ? 'text' : 'decimal'}
                        className={cellClass}
                        aria-invalid={timeError ? true : undefined}
                        onPaste={onPaste(i, 'time')}
                        onKeyDown={onKeyDown(i, 'time')}
                        {...register(`rows.${i}.time`)}
                      />
                      <FieldError message={timeError} />
                    </td>
                    <td className="px-2 py-1">
                      <input
                        aria-label={`Depth of reading ${i + 1}`}
                        inputMode="decimal"
                        className={cellClass}
                        aria-invalid={depthError ? true : undefined}
                        onPaste={onPaste(i, 'depth')}
                        onKeyDown={onKeyDown(i, 'depth')}
                        {...register(`rows.${i}.depth`)}
                      />
                      <FieldError message={depthError} />
                    </td>
                    <td className="px-1 py-1">
                      <button
                        type="button"
                        onClick={() => rows.remove(i)}
                        className="rounded p-1.5 text-slate-400 hover:bg-slate-100 hover:text-slate-700"
                        aria-label={`Remove reading ${i + 1}`}
                      >
                        <svg viewBox="0 0 20 20" className="size-4" aria-hidden="true">
                          <path d="M5 5l10 10M15 5L5 15" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
                        </svg>
                      </button>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <Button variant="secondary" size="sm" onClick={() => rows.append(emptyRows(5), { shouldFocus: false })}>
            Add 5 rows
          </Button>
          <p className="text-xs text-slate-600" role="status">
            {pasted}
          </p>
        </div>
        <FieldError message={errors.rows?.root?.message ?? errors.rows?.message} />
      </fieldset>

      <div className="grid gap-4 sm:grid-cols-3">
        <TextField label="Field crew" autoComplete="off" error={errors.fieldCrew?.message} {...register('fieldCrew')} />
        <div className="grid grid-cols-[1fr_6rem] items-start gap-2">
          <TextField label="Slug volume (optional)" inputMode="decimal" hint="For the expected H0." error={errors.slugVolume?.message} {...register('slugVolume')} />
          <SelectField label="Unit" {...register('slugVolumeUnit')}>
            {VOLUME_UNITS.map((u) => (
              <option key={u.id} value={u.id}>
                {u.label}
              </option>
            ))}
          </SelectField>
        </div>
        <TextAreaField label="Notes" className="sm:col-span-3" error={errors.notes?.message} {...register('notes')} />
      </div>

      <FormError message={errors.root?.server?.message} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" pending={formState.isSubmitting}>
          Save the readings
        </Button>
        <Button variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
