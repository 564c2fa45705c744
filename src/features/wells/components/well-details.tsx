import type { ReactNode } from 'react';
import type { DisplayUnits } from '@shared/schemas/sites';
import { WGS84_EPSG, type Well } from '@shared/schemas/wells';
import { formatDateTime } from '@/lib/format';
import { formatLength, formatNumber } from '../units';
import { StatusBadge } from './well-status';

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <>
      <dt className="text-slate-500">{term}</dt>
      <dd className="text-slate-800 tabular-nums">{children}</dd>
    </>
  );
}

/** Everything stored for a well, in the site's display units. */
export function WellDetails({ well, displayUnits, siteEpsg }: { well: Well; displayUnits: DisplayUnits; siteEpsg: number }) {
  const len = (m: number | null, g: 'elevation' | 'depth' | 'radius') => formatLength(m, displayUnits, g, true);
  const stickup = well.measuringPointElevationM - well.groundElevationM;
  const entered =
    well.inputEpsg === WGS84_EPSG
      ? `latitude ${well.inputY.toFixed(7)}°, longitude ${well.inputX.toFixed(7)}°`
      : `x ${well.inputX.toFixed(2)}, y ${well.inputY.toFixed(2)} in EPSG:${well.inputEpsg}`;
  return (
    <dl className="grid grid-cols-[8.5rem_minmax(0,1fr)] gap-x-4 gap-y-2.5 text-sm sm:grid-cols-[13rem_minmax(0,1fr)] sm:gap-x-6">
      <Row term="Status"><StatusBadge status={well.status} /></Row>
      <Row term="Hydrostratigraphic unit">{well.hydroUnit ?? <span className="text-slate-400">Not assigned</span>}</Row>
      <Row term="Aquifer condition">{well.aquiferCondition[0].toUpperCase() + well.aquiferCondition.slice(1)}</Row>
      <Row term={`Site coordinates (EPSG:${siteEpsg})`}>
        {well.siteX.toFixed(2)} E, {well.siteY.toFixed(2)} N
      </Row>
      <Row term="Latitude / longitude (WGS 84)">
        {well.lat.toFixed(6)}°, {well.lon.toFixed(6)}°
      </Row>
      <Row term="Entered as">{entered}</Row>
      <Row term="Ground elevation">{len(well.groundElevationM, 'elevation')}</Row>
      <Row term="Measuring point (top of casing)">
        {len(well.measuringPointElevationM, 'elevation')}{' '}
        <span className="text-slate-500">({stickup >= 0 ? `${len(stickup, 'depth')} above ground` : `${len(-stickup, 'depth')} below ground`})</span>
      </Row>
      <Row term="Screen interval (depth)">
        {len(well.screenTopDepthM, 'depth')} to {len(well.screenBottomDepthM, 'depth')} below ground{' '}
        <span className="text-slate-500">({len(well.screenLengthM, 'depth')} long)</span>
      </Row>
      <Row term="Screen interval (elevation)">
        {len(well.screenTopElevationM, 'elevation')} to {len(well.screenBottomElevationM, 'elevation')}
      </Row>
      <Row term="Casing inner radius">{len(well.casingRadiusM, 'radius')}</Row>
      <Row term="Screen radius">{len(well.screenRadiusM, 'radius')}</Row>
      <Row term="Borehole radius">{len(well.boreholeRadiusM, 'radius')}</Row>
      <Row term="Intake radius">{well.intakeRadius === 'borehole' ? 'Borehole (filter pack)' : 'Screen'}</Row>
      <Row term="Filter-pack porosity">{formatNumber(well.filterPackPorosity, 2)}</Row>
      <Row term="Static water depth">{well.staticWaterDepthM === null ? '—' : `${len(well.staticWaterDepthM, 'depth')} below measuring point`}</Row>
      <Row term="Static level to screen bottom (Lw)">
        {len(well.staticToScreenBottomM, 'depth')}
        {well.staticToScreenBottomDerived ? <span className="text-slate-500"> (from the static water depth)</span> : null}
      </Row>
      <Row term="Saturated thickness">{len(well.saturatedThicknessM, 'depth')}</Row>
      <Row term="Notes">
        <span className="whitespace-pre-line">{well.notes || <span className="text-slate-400">None</span>}</span>
      </Row>
      <Row term="Last changed">{formatDateTime(well.updatedAt)}</Row>
    </dl>
  );
}
