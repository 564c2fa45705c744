import { useCallback, useEffect, useRef, useState, type RefObject } from 'react';
import type { MapRef } from 'react-map-gl/maplibre';
import type { Polygon } from 'geojson';
import { TerraDraw, TerraDrawPolygonMode, TerraDrawSelectMode, type GeoJSONStoreFeatures } from 'terra-draw';
import { TerraDrawMapLibreGLAdapter } from 'terra-draw-maplibre-gl-adapter';

export type DrawPhase = { kind: 'off' } | { kind: 'drawing' } | { kind: 'drawn'; geometry: Polygon } | { kind: 'editing'; outlineId: string };

const POLYGON_STYLE = { fillColor: '#0f766e', outlineColor: '#0f766e', fillOpacity: 0.15, outlineWidth: 2 } as const;

/** terra-draw's vertex precision (it refuses more decimals than it keeps). */
const round = (ring: number[][]) => ring.map(([x, y]) => [Number(x.toFixed(9)), Number(y.toFixed(9))]);

/**
 * Drawing a new outline and editing an outline's vertices on the map, with terra-draw. The
 * instance is made on first use and stopped when the workspace goes.
 */
export function useDraw(mapRef: RefObject<MapRef | null>) {
  const drawRef = useRef<TerraDraw | null>(null);
  const [phase, setPhase] = useState<DrawPhase>({ kind: 'off' });
  const phaseRef = useRef(phase);
  phaseRef.current = phase;

  const ensure = useCallback((): TerraDraw | null => {
    if (drawRef.current) return drawRef.current;
    const map = mapRef.current?.getMap();
    if (!map) return null;
    const draw = new TerraDraw({
      adapter: new TerraDrawMapLibreGLAdapter({ map }),
      modes: [
        new TerraDrawPolygonMode({ styles: POLYGON_STYLE }),
        new TerraDrawSelectMode({
          flags: { polygon: { feature: { draggable: true, coordinates: { midpoints: true, draggable: true, deletable: true } } } },
          styles: { selectedPolygonColor: '#0f766e', selectedPolygonOutlineColor: '#0f766e', selectedPolygonFillOpacity: 0.2 },
        }),
      ],
    });
    draw.start();
    draw.on('finish', (id, context) => {
      if (phaseRef.current.kind !== 'drawing' || context.action !== 'draw') return;
      const feature = draw.getSnapshotFeature(id);
      if (feature?.geometry.type === 'Polygon') {
        draw.setMode('static');
        setPhase({ kind: 'drawn', geometry: feature.geometry as Polygon });
      }
    });
    drawRef.current = draw;
    return draw;
  }, [mapRef]);

  const stop = useCallback(() => {
    const draw = drawRef.current;
    if (draw) {
      draw.clear();
      draw.setMode('static');
    }
    setPhase({ kind: 'off' });
  }, []);

  const startDrawing = useCallback(() => {
    const draw = ensure();
    if (!draw) return;
    draw.clear();
    draw.setMode('polygon');
    setPhase({ kind: 'drawing' });
  }, [ensure]);

  /** Edits the outer ring of one polygon; returns a reason when it cannot. */
  const startEditing = useCallback(
    (outlineId: string, geometry: Polygon): string | null => {
      const draw = ensure();
      if (!draw) return 'The map is not ready yet.';
      draw.clear();
      draw.setMode('select');
      const feature: GeoJSONStoreFeatures = { type: 'Feature', id: outlineId, geometry: { type: 'Polygon', coordinates: [round(geometry.coordinates[0])] }, properties: { mode: 'polygon' } };
      const [result] = draw.addFeatures([feature]);
      if (!result?.valid) {
        draw.setMode('static');
        return `This outline cannot be edited on the map (${result?.reason ?? 'invalid shape'}).`;
      }
      draw.selectFeature(outlineId);
      setPhase({ kind: 'editing', outlineId });
      return null;
    },
    [ensure],
  );

  /** The shape being edited, as it stands. */
  const editedGeometry = useCallback((): Polygon | null => {
    const feature = drawRef.current?.getSnapshot().find((f) => f.geometry.type === 'Polygon');
    return feature ? (feature.geometry as Polygon) : null;
  }, []);

  useEffect(
    () => () => {
      try {
        drawRef.current?.stop();
      } catch {
        // The map may already be gone with its style.
      }
      drawRef.current = null;
    },
    [],
  );

  return { phase, startDrawing, startEditing, editedGeometry, stop };
}
