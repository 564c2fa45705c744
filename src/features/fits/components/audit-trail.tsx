import type { ReactNode } from 'react';
import { useSuspenseQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { FIT_METHODS } from '@shared/hydraulics/fitting';
import { MATERIALS } from '@shared/hydraulics/materials';
import { FIT_STATUS_LABELS, type FitEvent } from '@shared/schemas/fits';
import { formatDateTime } from '@/lib/format';
import { auditQueryOptions } from '../api';
import { formatK, formatQuantity } from '../format';
import { FLAG_NAMES } from './qc-flags';

const KIND_LABELS: Record<FitEvent['kind'], string> = {
  created: 'Created',
  'parameters-changed': 'Parameters changed',
  submitted: 'Submitted for check',
  checked: 'Checked',
  'sent-back': 'Sent back',
  'revision-started': 'Revision started',
  superseded: 'Superseded by a later Checked revision',
};

const FIELD_LABELS: Record<string, string> = {
  method: 'Method',
  model: 'Model',
  line: 'Line',
  window: 'Fitting window',
  note: 'Note',
  'geometry.casingRadiusM': 'Casing radius (m)',
  'geometry.screenRadiusM': 'Screen radius (m)',
  'geometry.boreholeRadiusM': 'Borehole radius (m)',
  'geometry.screenLengthM': 'Screen length (m)',
  'geometry.intake': 'Intake radius',
  'geometry.anisotropyRatio': 'Anisotropy Kh/Kv',
  'geometry.filterPackPorosity': 'Filter-pack porosity',
  'geometry.staticToScreenBottomM': 'Static level to screen bottom (m)',
  'geometry.saturatedThicknessM': 'Saturated thickness (m)',
  allowOscillation: 'Fit an oscillating record',
  material: 'Material',
  'highK.effectiveLengthM': 'Effective length L_e (m)',
  'highK.fitEffectiveLength': 'Fit L_e to the record',
  highK: 'High-K settings',
  effectiveLengthM: 'L_e (m)',
  fitEffectiveLength: 'fit L_e',
};

const VALUE_LABELS: Record<string, string> = {
  ...Object.fromEntries(FIT_METHODS.map((m) => [m.id, m.label])),
  anchored: 'anchored',
  free: 'free',
  line: 'straight line',
  'high-k': 'high-K model',
  ...FIT_STATUS_LABELS,
  ...Object.fromEntries(MATERIALS.map((m) => [m.id, m.label])),
};

function labelOf(key: string): string {
  return FIELD_LABELS[key] ?? key;
}

/** An audit value in words: windows spelled out, ids as their labels, numbers to four digits. */
export function describeAuditValue(value: unknown): string {
  if (value === null || value === undefined) return 'default';
  if (typeof value === 'number') return formatQuantity(value, 4);
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'string') return value === '' ? '(empty)' : (VALUE_LABELS[value] ?? value);
  if (Array.isArray(value)) return value.map(describeAuditValue).join(', ');
  if (typeof value === 'object') {
    const o = value as Record<string, unknown>;
    if (o.kind === 'time' && typeof o.fromSeconds === 'number' && typeof o.toSeconds === 'number') {
      return `t = ${formatQuantity(o.fromSeconds, 4)} – ${formatQuantity(o.toSeconds, 4)} s`;
    }
    if (o.kind === 'head' && typeof o.upper === 'number' && typeof o.lower === 'number') {
      return `H/H0 ${formatQuantity(o.upper, 4)} – ${formatQuantity(o.lower, 4)}`;
    }
    return Object.entries(o)
      .map(([k, v]) => `${labelOf(k)}: ${describeAuditValue(v)}`)
      .join('; ');
  }
  return String(value);
}

function isChange(v: unknown): v is { from: unknown; to: unknown } {
  return typeof v === 'object' && v !== null && 'from' in v && 'to' in v;
}

function Change({ field, from, to }: { field: string; from: unknown; to: unknown }) {
  // A window of null is the method's default: its recommended range.
  const show = (v: unknown) => (field === 'window' && v === null ? 'the recommended range' : describeAuditValue(v));
  return (
    <li className="break-words">
      <span className="text-slate-500">{labelOf(field)}: </span>
      <span className="text-slate-600">{show(from)}</span>
      <span aria-hidden="true"> → </span>
      <span className="sr-only">changed to </span>
      <span className="font-medium">{show(to)}</span>
    </li>
  );
}

function EventDetails({ event, siteId }: { event: FitEvent; siteId: string }) {
  const d = event.details;
  const changes = typeof d.changes === 'object' && d.changes !== null ? Object.entries(d.changes as Record<string, unknown>).filter(([, v]) => isChange(v)) : [];
  const items: ReactNode[] = [];
  if (event.kind === 'submitted' && typeof d.from === 'string') items.push(<li key="from">From {describeAuditValue(d.from)}</li>);
  if (event.kind === 'submitted' && typeof d.reasons === 'object' && d.reasons !== null) {
    for (const [code, reason] of Object.entries(d.reasons as Record<string, unknown>)) {
      items.push(
        <li key={`reason-${code}`} className="break-words">
          <span className="text-slate-500">Reason for keeping the fit despite the {FLAG_NAMES[code] ?? code} flag: </span>
          {String(reason)}
        </li>,
      );
    }
  }
  if (typeof d.resolved === 'string') items.push(<li key="resolved">Applied the suggested action for the {FLAG_NAMES[d.resolved] ?? d.resolved} flag</li>);
  if (event.kind === 'created') {
    items.push(
      <li key="created">
        {describeAuditValue(d.method)}, {describeAuditValue(d.line)} line
      </li>,
    );
  }
  if (typeof d.fromFitId === 'string') {
    items.push(
      <li key="fromFit">
        From{' '}
        <Link to={`/sites/${siteId}/fits/${d.fromFitId}`} className="text-accent-700 hover:underline">
          revision {describeAuditValue(d.fromRevision)}
        </Link>
      </li>,
    );
  }
  if (typeof d.byFitId === 'string') {
    items.push(
      <li key="byFit">
        By{' '}
        <Link to={`/sites/${siteId}/fits/${d.byFitId}`} className="text-accent-700 hover:underline">
          revision {describeAuditValue(d.byRevision)}
        </Link>
      </li>,
    );
  }
  for (const [field, value] of changes) {
    const c = value as { from: unknown; to: unknown };
    items.push(<Change key={field} field={field} from={c.from} to={c.to} />);
  }
  if ((event.kind === 'parameters-changed' || event.kind === 'revision-started') && changes.length === 0) {
    items.push(<li key="none">No parameter changed</li>);
  }
  if (typeof d.kMetersPerSecond === 'number') items.push(<li key="k">K = {formatK(d.kMetersPerSecond, 'm/s')}</li>);
  if (typeof d.comment === 'string' && d.comment !== '') {
    items.push(
      <li key="comment">
        <q className="italic">{d.comment}</q>
      </li>,
    );
  }
  if (items.length === 0) return null;
  return <ul className="mt-1 space-y-0.5 text-sm text-slate-700">{items}</ul>;
}

/** Every state and parameter change of one fit: who, when, what. */
export function AuditTrail({ fitId, siteId }: { fitId: string; siteId: string }) {
  const { data: events } = useSuspenseQuery(auditQueryOptions(fitId));
  return (
    <details className="group" open={events.length <= 6}>
      <summary className="cursor-pointer text-sm font-semibold text-slate-900">Audit trail ({events.length} {events.length === 1 ? 'event' : 'events'})</summary>
      <ol className="mt-3 space-y-3 border-l-2 border-slate-200 pl-4" aria-label="Audit trail">
        {events.map((event) => (
          <li key={event.id} className="relative">
            <span className="absolute top-1.5 -left-[1.4rem] size-2.5 rounded-full bg-accent-600 ring-2 ring-white" aria-hidden="true" />
            <p className="text-sm">
              <span className="font-medium text-slate-900">{KIND_LABELS[event.kind]}</span>
              <span className="text-slate-600">
                {' '}
                by {event.actor?.name ?? 'Kfield'} · <time dateTime={event.at}>{formatDateTime(event.at)}</time>
              </span>
            </p>
            <EventDetails event={event} siteId={siteId} />
          </li>
        ))}
      </ol>
    </details>
  );
}
