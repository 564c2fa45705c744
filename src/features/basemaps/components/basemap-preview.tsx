import { useState } from 'react';
import Map, { AttributionControl, NavigationControl, ScaleControl } from 'react-map-gl/maplibre';
import type { Basemap } from '@shared/schemas/basemaps';
import { Alert } from '@/components/ui/alert';
import { maplibre } from '@/lib/maplibre-init';

type MapState = 'loading' | 'idle' | 'error';

/**
 * A small map of one basemap, opened at the basemap's own centre. Its position is kept in the
 * address (#view=zoom/lat/lon) so a view can be shared or reloaded; data-map-state says when the
 * map has finished drawing.
 */
export function BasemapPreview({ basemap }: { basemap: Basemap }) {
  const [state, setState] = useState<MapState>('loading');
  const [zoom, setZoom] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [lon, lat, z] = basemap.metadata.center;
  return (
    <div className="space-y-3">
      <div
        className="relative h-[26rem] overflow-hidden rounded-md ring-1 ring-slate-200"
        data-testid="basemap-preview"
        data-map-state={state}
        data-map-zoom={zoom === null ? undefined : zoom.toFixed(1)}
      >
        <Map
          key={basemap.id}
          mapLib={maplibre}
          mapStyle={basemap.styleUrl}
          initialViewState={{ longitude: lon, latitude: lat, zoom: z }}
          hash="view"
          maxZoom={19}
          attributionControl={false}
          style={{ width: '100%', height: '100%' }}
          onMoveStart={() => setState('loading')}
          onIdle={(e) => {
            setZoom(e.target.getZoom());
            setState('idle');
          }}
          onError={(e) => {
            setState('error');
            setError(e.error?.message ?? 'The map could not be drawn');
          }}
        >
          <NavigationControl position="top-right" showCompass={false} />
          <ScaleControl position="bottom-left" unit="metric" />
          <AttributionControl position="bottom-right" compact />
        </Map>
      </div>
      {error ? <Alert tone="warning">{error}</Alert> : null}
      <p className="text-xs text-slate-500">
        Layers: {basemap.metadata.vectorLayers.map((l) => l.id).join(', ') || 'none listed'} ·{' '}
        {basemap.styleKind === 'kfield' ? 'drawn with Kfield’s style' : 'drawn with a plain style made from its layer list'}
      </p>
    </div>
  );
}
