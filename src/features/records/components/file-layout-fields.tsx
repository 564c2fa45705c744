import type { FileLayout } from '@shared/records/types';
import { DELIMITERS, type Delimiter } from '@shared/records/tokenize';
import type { FilePreview } from '@shared/schemas/records';
import { TIMESTAMP_LAYOUTS, type TimestampLayout } from '@shared/units/timestamp';
import type { TimeColumnFormat } from '@shared/units/time';
import { CheckboxField, SelectField, TextField } from '@/components/ui/field';
import { cn } from '@/lib/cn';

export type Mapping = NonNullable<FilePreview['mapping']>;

const lineOrNull = (text: string): number | null => {
  const n = Number(text);
  return text.trim() === '' || !Number.isInteger(n) || n < 1 ? null : n;
};

/** The detected layout of a file, shown for confirmation and changed in place. */
export function FileLayoutFields({ layout, onChange, idPrefix }: { layout: FileLayout; onChange: (layout: FileLayout) => void; idPrefix: string }) {
  const set = (patch: Partial<FileLayout>) => onChange({ ...layout, ...patch });
  return (
    <div className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-6">
      <SelectField id={`${idPrefix}-delimiter`} className="max-sm:col-span-2" label="Delimiter" value={layout.delimiter} onChange={(e) => set({ delimiter: e.target.value as Delimiter, ...(e.target.value === 'comma' ? { decimalComma: false } : {}) })}>
        {DELIMITERS.map((d) => (
          <option key={d.id} value={d.id}>
            {d.label}
          </option>
        ))}
      </SelectField>
      <TextField
        id={`${idPrefix}-header`}
        label="Header line"
        inputMode="numeric"
        placeholder="none"
        value={layout.headerLine ?? ''}
        onChange={(e) => set({ headerLine: lineOrNull(e.target.value) })}
      />
      <TextField
        id={`${idPrefix}-units`}
        label="Units line"
        inputMode="numeric"
        placeholder="none"
        value={layout.unitsLine ?? ''}
        onChange={(e) => set({ unitsLine: lineOrNull(e.target.value) })}
      />
      <TextField
        id={`${idPrefix}-first`}
        label="First reading on line"
        inputMode="numeric"
        value={layout.firstDataLine}
        onChange={(e) => set({ firstDataLine: lineOrNull(e.target.value) ?? 1 })}
      />
      <TextField
        id={`${idPrefix}-last`}
        label="Last reading on line"
        inputMode="numeric"
        placeholder="end of file"
        value={layout.lastDataLine ?? ''}
        onChange={(e) => set({ lastDataLine: lineOrNull(e.target.value) })}
      />
      <CheckboxField
        id={`${idPrefix}-comma`}
        className="self-end pb-2 max-sm:col-span-2"
        label="Decimal comma"
        checked={layout.decimalComma}
        disabled={layout.delimiter === 'comma'}
        onChange={(e) => set({ decimalComma: e.target.checked })}
      />
    </div>
  );
}

const TIME_FORMAT_OPTIONS: { id: TimeColumnFormat; label: string }[] = [
  { id: 'timestamp', label: 'Date and time' },
  { id: 's', label: 'Elapsed seconds' },
  { id: 'min', label: 'Elapsed minutes' },
  { id: 'h', label: 'Elapsed hours' },
  { id: 'd', label: 'Elapsed days' },
  { id: 'mm:ss', label: 'Elapsed mm:ss or h:mm:ss' },
];

function columnLabel(c: FilePreview['columns'][number]): string {
  const unit = c.unitText && !c.name.includes(c.unitText) ? ` (${c.unitText})` : '';
  return `${c.index + 1}. ${c.name}${unit}`;
}

/** Which columns hold the time (one, or date + time of day [+ AM/PM]) and the value. */
export function MappingFields({
  columns,
  mapping,
  onChange,
  idPrefix,
  valueLabel,
  zones,
}: {
  columns: FilePreview['columns'];
  mapping: Mapping;
  onChange: (mapping: Mapping) => void;
  idPrefix: string;
  valueLabel: string;
  zones: string[];
}) {
  const t = mapping.time;
  const setTime = (patch: Partial<Mapping['time']>) => onChange({ ...mapping, time: { ...t, ...patch } });
  const timestamp = t.format === 'timestamp';
  const options = (includeNone: boolean) => (
    <>
      {includeNone ? <option value="">none</option> : null}
      {columns.map((c) => (
        <option key={c.index} value={c.index}>
          {columnLabel(c)}
        </option>
      ))}
    </>
  );
  const setColumn = (k: number, value: string) => {
    const cols = [...t.columns];
    if (value === '') cols.splice(k);
    else cols[k] = Number(value);
    setTime({ columns: cols.filter((c, i) => i === 0 || c !== undefined) });
  };
  return (
    <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
      <SelectField
        id={`${idPrefix}-time-format`}
        label="Time is written as"
        value={t.format}
        onChange={(e) => {
          const format = e.target.value as TimeColumnFormat;
          setTime({ format, columns: format === 'timestamp' ? t.columns : t.columns.slice(0, 1), ...(format === 'timestamp' && !t.timestampLayout ? { timestampLayout: 'iso' as TimestampLayout } : {}) });
        }}
      >
        {TIME_FORMAT_OPTIONS.map((f) => (
          <option key={f.id} value={f.id}>
            {f.label}
          </option>
        ))}
      </SelectField>
      <SelectField id={`${idPrefix}-time-column`} label={timestamp ? 'Date (and time) column' : 'Time column'} value={t.columns[0] ?? 0} onChange={(e) => setColumn(0, e.target.value)}>
        {options(false)}
      </SelectField>
      {timestamp ? (
        <>
          <SelectField id={`${idPrefix}-clock-column`} label="Time-of-day column, if separate" value={t.columns[1] ?? ''} onChange={(e) => setColumn(1, e.target.value)}>
            {options(true)}
          </SelectField>
          <SelectField id={`${idPrefix}-date-layout`} label="Date layout" value={t.timestampLayout ?? 'iso'} onChange={(e) => setTime({ timestampLayout: e.target.value as TimestampLayout })}>
            {TIMESTAMP_LAYOUTS.map((l) => (
              <option key={l.id} value={l.id}>
                {l.label}
              </option>
            ))}
          </SelectField>
          <TextField
            id={`${idPrefix}-zone`}
            label="Time zone of the timestamps"
            list={`${idPrefix}-zones`}
            value={t.timeZone}
            hint="IANA name, e.g. Europe/Berlin; timestamps with their own offset keep it."
            onChange={(e) => setTime({ timeZone: e.target.value })}
          />
          <datalist id={`${idPrefix}-zones`}>
            {zones.map((z) => (
              <option key={z} value={z} />
            ))}
          </datalist>
        </>
      ) : null}
      <SelectField id={`${idPrefix}-value-column`} label={valueLabel} value={mapping.valueColumn} onChange={(e) => onChange({ ...mapping, valueColumn: Number(e.target.value) })}>
        {options(false)}
      </SelectField>
    </div>
  );
}

/** The first rows of the file as Kfield reads them, the mapped columns marked. */
export function PreviewTable({ preview, mapping, caption }: { preview: FilePreview; mapping: Mapping | null; caption: string }) {
  const timeColumns = new Set(mapping?.time.columns ?? []);
  const valueColumn = mapping?.valueColumn;
  const mark = (i: number) => (timeColumns.has(i) ? 'bg-accent-50' : i === valueColumn ? 'bg-amber-50' : '');
  return (
    <div className="overflow-x-auto rounded-md ring-1 ring-slate-200">
      <table className="w-full border-collapse text-left text-xs">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-slate-50">
          <tr>
            <th scope="col" className="px-2 py-1.5 font-medium text-slate-500">
              Line
            </th>
            {preview.columns.map((c) => (
              <th key={c.index} scope="col" className={cn('px-2 py-1.5 font-medium whitespace-nowrap text-slate-700', mark(c.index))}>
                {c.name}
                {c.unitText && !c.name.includes(c.unitText) ? <span className="font-normal text-slate-500"> ({c.unitText})</span> : null}
                <span className="block font-normal text-slate-500">
                  {timeColumns.has(c.index) ? 'time' : c.index === valueColumn ? 'value' : c.kind}
                </span>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {preview.rows.map((r) => (
            <tr key={r.line} className="border-t border-slate-100">
              <td className="px-2 py-1 text-slate-500 tabular-nums">{r.line}</td>
              {preview.columns.map((c) => (
                <td key={c.index} className={cn('px-2 py-1 whitespace-nowrap text-slate-800 tabular-nums', mark(c.index))}>
                  {r.fields[c.index] ?? ''}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
