import { useEffect, useState } from 'react';
import { loadCrs, toSiteXY } from '../crs';
import { useCursor, type CursorStore } from './cursor-store';

function formatLatLon(lat: number, lon: number): string {
  const ns = lat >= 0 ? 'N' : 'S';
  const ew = lon >= 0 ? 'E' : 'W';
  return `${Math.abs(lat).toFixed(5)}° ${ns}, ${Math.abs(lon).toFixed(5)}° ${ew}`;
}

const grouped = new Intl.NumberFormat('en', { minimumFractionDigits: 1, maximumFractionDigits: 1 });

/** The pointer's position in the site's coordinate reference system (proj4) and in latitude/longitude. */
export function CursorReadout({
  store,
  epsgCode,
  crsName,
  crsUnit,
  readK,
}: {
  store: CursorStore;
  epsgCode: number;
  crsName: string;
  crsUnit: string | null;
  /** The K surface's value at a point, written out; null where the surface has no value. Unset: no surface shown. */
  readK?: ((lon: number, lat: number) => string | null) | null;
}) {
  const cursor = useCursor(store);
  const [projection, setProjection] = useState<{ code: number; name: string | null } | null>(null);

  useEffect(() => {
    let live = true;
    loadCrs(epsgCode).then(
      (name) => live && setProjection({ code: epsgCode, name }),
      () => live && setProjection({ code: epsgCode, name: null }),
    );
    return () => {
      live = false;
    };
  }, [epsgCode]);

  const crs = projection?.code === epsgCode ? projection.name : undefined;
  let site = '—';
  if (cursor && crs && epsgCode !== 4326) {
    const [x, y] = toSiteXY(crs, cursor.lon, cursor.lat);
    const unit = shortUnit(crsUnit);
    site = `x ${grouped.format(x)}${unit}, y ${grouped.format(y)}${unit}`;
  } else if (cursor && epsgCode === 4326) {
    site = formatLatLon(cursor.lat, cursor.lon);
  } else if (crs === null) {
    site = 'no proj4 definition for this code';
  }

  return (
    <dl className="grid gap-x-4 gap-y-0.5 text-xs text-slate-700 sm:grid-cols-[auto_1fr]" aria-label="Pointer position" data-testid="cursor-readout">
      <dt className="font-medium text-slate-600">
        EPSG:{epsgCode} <span className="font-normal">({crsName})</span>
      </dt>
      <dd className="tabular-nums" data-testid="cursor-site">
        {cursor ? site : 'Point at (or tap) the map'}
      </dd>
      <dt className="font-medium text-slate-600">Latitude, longitude (WGS 84)</dt>
      <dd className="tabular-nums" data-testid="cursor-latlon">
        {cursor ? formatLatLon(cursor.lat, cursor.lon) : 'Point at (or tap) the map'}
      </dd>
      {readK ? (
        <>
          <dt className="font-medium text-slate-600">K surface (estimate)</dt>
          <dd className="tabular-nums" data-testid="cursor-k">
            {cursor ? (readK(cursor.lon, cursor.lat) ?? 'outside the surface') : 'Point at (or tap) the map'}
          </dd>
        </>
      ) : null}
    </dl>
  );
}

function shortUnit(unit: string | null): string {
  if (!unit) return '';
  if (unit === 'metre') return ' m';
  if (/foot/i.test(unit)) return /US survey/i.test(unit) ? ' ftUS' : ' ft';
  return ` ${unit}`;
}
