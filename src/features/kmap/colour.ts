import type { ExpressionSpecification } from 'maplibre-gl';
import { EXPRESSION_STOPS, expressionStops, type KColourScale } from '@shared/plot/k-colour';

// The scale itself is pure and shared with the site report's map figure (shared/plot/k-colour.ts).
export {
  EXPRESSION_STOPS,
  decadeDomain,
  decadeTicks,
  domainSi,
  expressionStops,
  kColourScale,
  legendFraction,
  parseColour,
  unitLog10Offset,
  type DecadeDomain,
  type KColourScale,
} from '@shared/plot/k-colour';

/**
 * The scale as a maplibre `interpolate` expression on a feature's log10K (m/s). A stop sits in the
 * middle of each of the scheme's 256 colours, so a well is drawn in d3's colour for its K (between
 * two stops maplibre blends neighbouring colours, which differ by at most 3 of 255 per channel).
 */
export function colourExpression(scale: KColourScale, stops = EXPRESSION_STOPS): ExpressionSpecification {
  const pairs: (number | string)[] = [];
  for (const v of expressionStops(scale, stops)) pairs.push(v, scale(v));
  return ['interpolate', ['linear'], ['get', 'log10K'], ...pairs] as ExpressionSpecification;
}
