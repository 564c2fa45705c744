import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { expression as styleExpression, latest, type StylePropertySpecification } from '@maplibre/maplibre-gl-style-spec';
import { scaleSequential } from 'd3-scale';
import { interpolateViridis } from 'd3-scale-chromatic';
import {
  colourExpression,
  decadeDomain,
  decadeTicks,
  domainSi,
  expressionStops,
  kColourScale,
  legendFraction,
  parseColour,
  unitLog10Offset,
} from '@/features/kmap/colour';
import { kToSi } from '@shared/units/conductivity';

/** The expression as maplibre itself evaluates a circle-color for a feature with this log10K. */
function drawnColour(expr: unknown, log10K: number): [number, number, number] {
  const parsed = styleExpression.createPropertyExpression(expr, 'paint', latest.paint_circle['circle-color'] as StylePropertySpecification);
  if (parsed.result !== 'success') throw new Error(parsed.value.map((e) => e.message).join('; '));
  const c = parsed.value.evaluate({ zoom: 14 }, { type: 'Point', properties: { log10K }, geometry: [] } as never) as { r: number; g: number; b: number };
  return [Math.round(c.r * 255), Math.round(c.g * 255), Math.round(c.b * 255)];
}

/** d3-scale with d3-scale-chromatic's viridis is the reference: the legend draws with it. */
const reference = (lo: number, hi: number) => scaleSequential(interpolateViridis).domain([lo, hi]);

/**
 * Viridis is a ramp of 256 colours whose neighbours differ by at most 3 of 255 in a channel; between
 * two stops maplibre blends neighbours, so it may be off by half that, rounded: 2.
 */
function expectSameColour(drawn: [number, number, number], want: [number, number, number]) {
  for (let c = 0; c < 3; c++) expect(Math.abs(drawn[c] - want[c]), `channel ${c}: ${drawn} vs ${want}`).toBeLessThanOrEqual(2);
}

describe('K colour expression', () => {
  const domain = decadeDomain([-6.3, -2.2], 'm/s');
  const scale = kColourScale(domain);
  const expr = colourExpression(scale);

  it('draws exactly d3’s colour at every stop', () => {
    const [lo, hi] = domainSi(domain);
    const ref = reference(lo, hi);
    const stops = expressionStops(scale);
    expect(stops).toHaveLength(256);
    for (const v of stops) expect(drawnColour(expr, v)).toEqual(parseColour(ref(v)));
  });

  it('draws d3’s colour between stops too, for any K in the domain', () => {
    const [lo, hi] = domainSi(domain);
    const ref = reference(lo, hi);
    fc.assert(
      fc.property(fc.double({ min: lo, max: hi, noNaN: true }), (v) => expectSameColour(drawnColour(expr, v), parseColour(ref(v)))),
      { numRuns: 400 },
    );
  });

  it('clamps K outside the domain to the colours of its ends, as d3 does', () => {
    const [lo, hi] = domainSi(domain);
    const ref = reference(lo, hi);
    expect(drawnColour(expr, lo - 3)).toEqual(parseColour(ref(lo - 3)));
    expect(drawnColour(expr, hi + 3)).toEqual(parseColour(ref(hi + 3)));
  });
});

describe('decade domain', () => {
  it('spans the whole decades that hold the site’s K values', () => {
    expect(decadeDomain([Math.log10(3.2e-6), Math.log10(4.5e-3)], 'm/s')).toEqual({ unit: 'm/s', fromDecade: -6, toDecade: -2 });
  });

  it('keeps a K that is a power of ten on its decade, not the next one out', () => {
    expect(decadeDomain([-5, -3], 'm/s')).toEqual({ unit: 'm/s', fromDecade: -5, toDecade: -3 });
    // 1e-4 m/s is 8.64 m/d: the decades are those of m/d.
    expect(decadeDomain([Math.log10(kToSi(1, 'm/d')), Math.log10(kToSi(100, 'm/d'))], 'm/d')).toEqual({ unit: 'm/d', fromDecade: 0, toDecade: 2 });
  });

  it('is at least one decade wide when every well has the same K', () => {
    expect(decadeDomain([-4.5, -4.5], 'm/s')).toEqual({ unit: 'm/s', fromDecade: -5, toDecade: -4 });
    expect(decadeDomain([-4], 'm/s')).toEqual({ unit: 'm/s', fromDecade: -4, toDecade: -3 });
  });

  it('is written in whole decades of the chosen unit', () => {
    // 2e-5 m/s = 5.67 ft/d and 3e-3 m/s = 850 ft/d (ft = 0.3048 m, d = 86 400 s).
    const d = decadeDomain([Math.log10(2e-5), Math.log10(3e-3)], 'ft/d');
    expect(d).toEqual({ unit: 'ft/d', fromDecade: 0, toDecade: 3 });
    const [lo, hi] = domainSi(d);
    expect(10 ** lo).toBeCloseTo(kToSi(1, 'ft/d'), 12);
    expect(10 ** hi).toBeCloseTo(kToSi(1000, 'ft/d'), 9);
  });

  it('falls back to 10⁻⁷ … 10⁻² m/s when no well has a Well K', () => {
    expect(decadeDomain([], 'm/s')).toEqual({ unit: 'm/s', fromDecade: -7, toDecade: -2 });
    expect(decadeDomain([NaN], 'cm/s')).toEqual({ unit: 'cm/s', fromDecade: -5, toDecade: 0 });
  });

  it('converts log10 K between units by a constant offset (cm/s is 10² of m/s)', () => {
    expect(unitLog10Offset('m/s')).toBe(0);
    expect(unitLog10Offset('cm/s')).toBeCloseTo(2, 12);
  });
});

describe('log scale of the legend', () => {
  it('puts a factor of ten at the same distance along the legend at every decade', () => {
    const domain = decadeDomain([-8, -1], 'm/s');
    fc.assert(
      fc.property(fc.double({ min: -8, max: -2, noNaN: true }), fc.double({ min: -8, max: -2, noNaN: true }), (a, b) => {
        const stepA = legendFraction(domain, a + 1) - legendFraction(domain, a);
        const stepB = legendFraction(domain, b + 1) - legendFraction(domain, b);
        expect(stepA).toBeCloseTo(stepB, 12);
        expect(stepA).toBeCloseTo(1 / 7, 12);
      }),
    );
  });

  it('spaces the decade ticks evenly from one end of the legend to the other', () => {
    const ticks = decadeTicks(decadeDomain([Math.log10(2e-6), Math.log10(5e-3)], 'm/s'));
    expect(ticks.map((t) => t.decade)).toEqual([-6, -5, -4, -3, -2]);
    expect(ticks.map((t) => t.fraction)).toEqual([0, 0.25, 0.5, 0.75, 1]);
  });

  it('gives each decade tick the colour d3 gives a K of that power of ten', () => {
    const domain = decadeDomain([Math.log10(2e-6), Math.log10(5e-3)], 'm/s');
    const scale = kColourScale(domain);
    const expr = colourExpression(scale);
    for (const t of decadeTicks(domain)) {
      expectSameColour(drawnColour(expr, t.decade), parseColour(reference(-6, -2)(t.decade)));
    }
  });
});
