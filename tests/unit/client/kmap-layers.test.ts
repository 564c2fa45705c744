import { describe, expect, it } from 'vitest';
import { validateStyleMin, type StyleSpecification } from '@maplibre/maplibre-gl-style-spec';
import { colourExpression, decadeDomain, kColourScale } from '@/features/kmap/colour';
import { WELLS_SOURCE, binHighlightLayer, labelsFilter, labelsLayer, selectedLayers, unanalysedLayer, wellSizes, wellsLayer } from '@/features/kmap/layers';
import { pixelsPerMetre } from '@/features/kmap/model';

const at = (spacingM: number) => (zoom: number) => spacingM * pixelsPerMetre(zoom, 47.76);

describe('K map layers', () => {
  it('are valid maplibre style layers', () => {
    const sizes = wellSizes(at(100));
    const style = {
      version: 8,
      glyphs: '/tiles/glyphs/{fontstack}/{range}.pbf',
      sources: { [WELLS_SOURCE]: { type: 'geojson', data: { type: 'FeatureCollection', features: [] } } },
      layers: [
        ...selectedLayers(['a', 'b'], sizes),
        unanalysedLayer(sizes),
        wellsLayer(colourExpression(kColourScale(decadeDomain([-6, -3], 'm/s'))), sizes),
        binHighlightLayer(3, sizes),
        labelsLayer,
        ...([[true, false], [false, true], [false, false]] as const).map(([a, b], i) => ({ ...labelsLayer, id: `names-${i}`, filter: labelsFilter(a, b) })),
      ],
    } as unknown as StyleSpecification;
    expect(validateStyleMin(style).map((e) => e.message)).toEqual([]);
    const noBin = { ...style, layers: [binHighlightLayer(-1, sizes)] } as unknown as StyleSpecification;
    expect(validateStyleMin(noBin).map((e) => e.message)).toEqual([]);
  });

  it('draws a sparse network at the base sizes and shrinks a dense one where its wells would overlap', () => {
    // Zooms 8, 10, 12, 13, 14 … 20. 100 m apart (the demo site): the base sizes from zoom 12 on.
    const sparse = wellSizes(at(100)).radii;
    const none = wellSizes(null).radii;
    expect(sparse.slice(2)).toEqual(none.slice(2));
    // 7.5 m apart: at zoom 14 the wells are 2.3 px apart, so the radius is the 2 px floor; from 18 on the base size.
    const dense = wellSizes(at(7.5)).radii;
    expect(dense[4]).toBe(2);
    expect(dense[4]).toBeLessThan(none[4]);
    expect(dense.slice(8)).toEqual(none.slice(8));
    for (let i = 1; i < dense.length; i++) expect(dense[i]).toBeGreaterThanOrEqual(dense[i - 1]);
  });
});
