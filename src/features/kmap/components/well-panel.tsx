import type { ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { FIT_STATUS_LABELS, type Fit } from '@shared/schemas/fits';
import type { MapWellProperties } from '@shared/schemas/map';
import type { DisplayUnits } from '@shared/schemas/sites';
import type { KUnit } from '@shared/units/conductivity';
import { Badge } from '@/components/ui/badge';
import { Spinner } from '@/components/ui/spinner';
import { describeError } from '@/lib/errors';
import { formatDate } from '@/lib/format';
import { mapWellFitsQueryOptions, mapWellQueryOptions } from '../api';
import { formatK, formatLength, formatSpread } from '../format';

const METHOD_LABELS: Record<Fit['method'], string> = { hvorslev: 'Hvorslev', 'bouwer-rice': 'Bouwer-Rice' };
const STATUS_TONES = { draft: 'neutral', 'awaiting-check': 'warning', checked: 'accent', 'sent-back': 'danger' } as const;
const CONDITION_LABELS = { confined: 'Confined', unconfined: 'Unconfined', leaky: 'Leaky' } as const;

/** One label and value of a well's details. */
export function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="flex justify-between gap-3 py-1">
      <dt className="text-slate-600">{label}</dt>
      <dd className="text-right text-slate-900 tabular-nums">{children}</dd>
    </div>
  );
}

/** Everything behind one well's colour: Well K, its screen, unit and construction, and the fits it comes from. */
export function WellPanel({ siteId, well, units, kUnit }: { siteId: string; well: MapWellProperties; units: DisplayUnits; kUnit: KUnit }) {
  const detail = useQuery(mapWellQueryOptions(well.id));
  const fits = useQuery(mapWellFitsQueryOptions(well.id));
  const len = (m: number, group: 'elevation' | 'depth' | 'radius') => formatLength(m, units, group);

  return (
    <article aria-labelledby="kmap-well-title" className="space-y-3 text-sm" data-testid="well-panel">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 id="kmap-well-title" className="text-base font-semibold text-slate-900">
          {well.name}
        </h3>
        <Link to={`/sites/${siteId}/wells/${well.id}`} className="text-sm text-accent-700 hover:underline">
          Well page
        </Link>
      </header>

      <WellKBox well={well} kUnit={kUnit} />

      <section aria-label="Screen interval">
        <h4 className="text-xs font-semibold tracking-wide text-slate-600 uppercase">Screen interval</h4>
        <dl className="divide-y divide-slate-100">
          <Row label="Depth below ground">
            {len(well.screenTopDepthM, 'depth')} – {len(well.screenBottomDepthM, 'depth')}
          </Row>
          <Row label="Elevation">
            {len(well.screenTopElevationM, 'elevation')} – {len(well.screenBottomElevationM, 'elevation')}
          </Row>
          <Row label="Hydrostratigraphic unit">{well.hydroUnit ?? 'Not given'}</Row>
        </dl>
      </section>

      <section aria-label="Construction">
        <h4 className="text-xs font-semibold tracking-wide text-slate-600 uppercase">Construction</h4>
        {detail.isPending ? (
          <Spinner label="Loading the well…" />
        ) : detail.isError ? (
          <p className="text-red-700">{describeError(detail.error)}</p>
        ) : (
          <dl className="divide-y divide-slate-100">
            <Row label="Ground elevation">{len(detail.data.groundElevationM, 'elevation')}</Row>
            <Row label="Measuring point">{len(detail.data.measuringPointElevationM, 'elevation')}</Row>
            <Row label="Screen length">{len(detail.data.screenLengthM, 'depth')}</Row>
            <Row label="Casing / screen / borehole radius">
              {len(detail.data.casingRadiusM, 'radius')} / {len(detail.data.screenRadiusM, 'radius')} / {len(detail.data.boreholeRadiusM, 'radius')}
            </Row>
            <Row label="Aquifer condition">{CONDITION_LABELS[detail.data.aquiferCondition]}</Row>
            {detail.data.staticWaterDepthM !== null ? <Row label="Static water depth">{len(detail.data.staticWaterDepthM, 'depth')}</Row> : null}
            <Row label="Status">{detail.data.status[0].toUpperCase() + detail.data.status.slice(1)}</Row>
          </dl>
        )}
      </section>

      <section aria-label="Fits">
        <h4 className="text-xs font-semibold tracking-wide text-slate-600 uppercase">Fits</h4>
        {fits.isPending ? (
          <Spinner label="Loading the fits…" />
        ) : fits.isError ? (
          <p className="text-red-700">{describeError(fits.error)}</p>
        ) : fits.data.length === 0 ? (
          <p className="text-slate-600">No fits yet.</p>
        ) : (
          <ul className="divide-y divide-slate-100">
            {fits.data.map((f) => {
              const counts = f.status === 'checked' && f.supersededAt === null;
              return (
                <li key={f.id} className="flex flex-wrap items-center justify-between gap-2 py-1.5">
                  <Link to={`/sites/${siteId}/fits/${f.id}`} className="text-accent-700 hover:underline">
                    {METHOD_LABELS[f.method]} · {formatK(f.result.kMetersPerSecond, kUnit)}
                  </Link>
                  <span className="flex items-center gap-1.5 text-xs text-slate-600">
                    <Badge tone={STATUS_TONES[f.status]}>{FIT_STATUS_LABELS[f.status]}</Badge>
                    {f.supersededAt ? <Badge tone="neutral">Superseded</Badge> : null}
                    {counts ? <span title="This fit is part of the Well K">in Well K</span> : null}
                    <span>{formatDate(f.checkedAt ?? f.createdAt)}</span>
                  </span>
                </li>
              );
            })}
          </ul>
        )}
      </section>
    </article>
  );
}

/** A well's Well K with the number of Checked fits behind it and their spread. */
export function WellKBox({ well, kUnit }: { well: Pick<MapWellProperties, 'wellK' | 'count' | 'log10StdDev'>; kUnit: KUnit }) {
  return (
    <div className="rounded-md bg-slate-50 px-3 py-2 ring-1 ring-slate-200">
      <p className="text-xs font-medium tracking-wide text-slate-600 uppercase">Well K</p>
      {well.wellK !== null ? (
        <>
          <p className="text-lg font-semibold text-slate-900 tabular-nums" data-testid="well-k">
            {formatK(well.wellK, kUnit)}
          </p>
          <p className="text-xs text-slate-600">
            Geometric mean of {well.count} Checked {well.count === 1 ? 'fit' : 'fits'}
            {well.log10StdDev !== null && well.count > 1 ? `; spread ${formatSpread(well.log10StdDev)} (± ${well.log10StdDev.toFixed(2)} in log10 K)` : ''}
          </p>
        </>
      ) : (
        <p className="text-slate-700">No Checked fit yet: drawn as a grey ring.</p>
      )}
    </div>
  );
}
