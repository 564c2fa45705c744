import { useMemo } from 'react';
import { Layer, Source } from 'react-map-gl/maplibre';
import type { FeatureCollection, Geometry } from 'geojson';
import type { ViewOutline, ViewSketch } from '@shared/schemas/viewer-links';
import { LAYER_IDS } from '../layers';
import { envelopeFillLayer, envelopeLineLayer, outlineFillLayer, outlineLabelLayer, outlineLineLayer, sketchPointsLayer, SOURCES } from '../surface/layers';
import { sketchesCollection, SurfaceImage, useBlankCorners, type SurfaceImageData } from '../surface/overlays';

const BELOW_WELLS = LAYER_IDS.selectedHalo;
const visible = (on: boolean) => ({ visibility: (on ? 'visible' : 'none') as 'visible' | 'none' });

export interface ViewLayersShown {
  surface: boolean;
  outlines: boolean;
  sketches: boolean;
}

interface Props {
  image: SurfaceImageData | null;
  outlines: readonly ViewOutline[];
  /** The outline the frozen K surface is clipped to, drawn as the chosen one. */
  surfaceOutlineId: string | null;
  sketches: readonly ViewSketch[];
  shown: ViewLayersShown;
  hasGlyphs: boolean;
  siteBounds: [number, number, number, number] | null;
}

/** What a viewer link shows under the wells: the frozen K surface, the outlines and the capture sketches. */
export function ViewOverlays({ image, outlines, surfaceOutlineId, sketches, shown, hasGlyphs, siteBounds }: Props) {
  const blankCorners = useBlankCorners(siteBounds);
  const outlineData = useMemo<FeatureCollection>(
    () => ({
      type: 'FeatureCollection',
      features: outlines.map((o) => ({ type: 'Feature', id: o.id, geometry: o.geometry as Geometry, properties: { name: o.name, chosen: shown.surface && o.id === surfaceOutlineId } })),
    }),
    [outlines, surfaceOutlineId, shown.surface],
  );
  const sketchData = useMemo(() => sketchesCollection(sketches), [sketches]);
  return (
    <>
      <SurfaceImage image={image} blankCorners={blankCorners} opacity={0.75} shown={shown.surface} />
      <Source id={SOURCES.outlines} type="geojson" data={outlineData}>
        <Layer {...outlineFillLayer} layout={visible(shown.outlines)} beforeId={BELOW_WELLS} />
        <Layer {...outlineLineLayer} layout={visible(shown.outlines)} beforeId={BELOW_WELLS} />
        {hasGlyphs ? <Layer {...outlineLabelLayer} layout={{ ...outlineLabelLayer.layout, ...visible(shown.outlines) }} beforeId={BELOW_WELLS} /> : null}
      </Source>
      <Source id={SOURCES.sketches} type="geojson" data={sketchData}>
        <Layer {...envelopeFillLayer} layout={visible(shown.sketches)} beforeId={BELOW_WELLS} />
        <Layer {...envelopeLineLayer} layout={visible(shown.sketches)} beforeId={BELOW_WELLS} />
        <Layer {...sketchPointsLayer} layout={visible(shown.sketches)} beforeId={BELOW_WELLS} />
      </Source>
    </>
  );
}
