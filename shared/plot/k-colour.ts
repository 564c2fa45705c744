import { scaleSequential, type ScaleSequential } from 'd3-scale';
import { interpolateViridis } from 'd3-scale-chromatic';
import { kFromSi, type KUnit } from '../units/conductivity';

/*
 * The K map's colour scale, shared by the map in the browser and the site report's figure. Colour follows log10 of Well K (m/s) on a sequential scheme that
 * stays readable with the common colour-vision deficiencies (viridis: dark violet for low K,
 * yellow for high K). The domain always spans whole decades of the unit the legend is written
 * in, so every legend tick is a round power of ten in that unit.
 */

export type KColourScale = ScaleSequential<string>;

/** A span of whole decades in a K unit: 10^fromDecade … 10^toDecade of `unit`. */
export interface DecadeDomain {
  unit: KUnit;
  fromDecade: number;
  toDecade: number;
}

/** Shown when no well has a Checked fit yet: 10⁻⁷ … 10⁻² m/s, silt to clean gravel. */
const EMPTY_DOMAIN_SI = [-7, -2] as const;
// log10 of K converted from SI is not exact at powers of ten; this absorbs the last bits.
const EPSILON = 1e-9;

/** log10(K in `unit`) − log10(K in m/s): adding it turns an SI log10 K into the unit's. */
export function unitLog10Offset(unit: KUnit): number {
  return Math.log10(kFromSi(1, unit));
}

/** The whole decades of `unit` that hold every value (log10 K in m/s); at least one decade. */
export function decadeDomain(log10KsSi: Iterable<number>, unit: KUnit): DecadeDomain {
  const offset = unitLog10Offset(unit);
  let min = Infinity;
  let max = -Infinity;
  for (const v of log10KsSi) {
    if (!Number.isFinite(v)) continue;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (min === Infinity) {
    min = EMPTY_DOMAIN_SI[0];
    max = EMPTY_DOMAIN_SI[1];
  }
  // `+ 0` turns a −0 from Math.ceil into 0.
  const fromDecade = Math.floor(min + offset + EPSILON) + 0;
  let toDecade = Math.ceil(max + offset - EPSILON) + 0;
  if (toDecade <= fromDecade) toDecade = fromDecade + 1;
  return { unit, fromDecade, toDecade };
}

/** The domain's ends as log10 K in m/s (what the map's features carry). */
export function domainSi(domain: DecadeDomain): [number, number] {
  const offset = unitLog10Offset(domain.unit);
  return [domain.fromDecade - offset, domain.toDecade - offset];
}

/** d3's sequential scale from log10 K (m/s) to a colour, over the domain's decades. */
export function kColourScale(domain: DecadeDomain): KColourScale {
  return scaleSequential(interpolateViridis).domain(domainSi(domain));
}

/** Where log10 K (m/s) falls along the legend, 0 at its low end and 1 at its high end (linear in log10 K). */
export function legendFraction(domain: DecadeDomain, log10KSi: number): number {
  const [lo, hi] = domainSi(domain);
  return (log10KSi - lo) / (hi - lo);
}

/** The decade ticks of the legend: value 10^decade in the domain's unit, at `fraction` along it. */
export function decadeTicks(domain: DecadeDomain): { decade: number; fraction: number }[] {
  const span = domain.toDecade - domain.fromDecade;
  const ticks = [];
  for (let d = domain.fromDecade; d <= domain.toDecade; d++) ticks.push({ decade: d, fraction: (d - domain.fromDecade) / span });
  return ticks;
}

/** Stops of the map expression: one per colour of the scheme (viridis is a ramp of 256 colours). */
export const EXPRESSION_STOPS = 256;

/** The log10 K (m/s) of each stop: the middle of each of the scheme's colour steps. */
export function expressionStops(scale: KColourScale, stops = EXPRESSION_STOPS): number[] {
  const [lo, hi] = scale.domain();
  return Array.from({ length: stops }, (_, i) => lo + ((hi - lo) * (i + 0.5)) / stops);
}

/** "#rrggbb" or "rgb(r, g, b)" as [r, g, b] in 0…255. */
export function parseColour(colour: string): [number, number, number] {
  const hex = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(colour);
  if (hex) return [parseInt(hex[1], 16), parseInt(hex[2], 16), parseInt(hex[3], 16)];
  const rgb = /^rgba?\(\s*([\d.]+)\s*,\s*([\d.]+)\s*,\s*([\d.]+)/i.exec(colour);
  if (rgb) return [Number(rgb[1]), Number(rgb[2]), Number(rgb[3])];
  throw new Error(`Not a colour: ${colour}`);
}
