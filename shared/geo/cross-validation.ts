import type { GridSpec, IdwOptions, IdwPoint } from './idw';

export interface CrossValidationWell {
  id: string;
  observedLog10K: number;
  predictedLog10K: number;
  errorLog10: number;
}

export interface CrossValidationResult {
  power: number;
  n: number;
  rmseLog10: number;
  meanErrorLog10: number;
  byPower: { power: number; rmseLog10: number; meanErrorLog10: number }[];
  suggestedPower: number;
  wells: CrossValidationWell[];
}

export interface TestSpot {
  x: number;
  y: number;
  score: number;
  nearestWellM: number;
}

export function crossValidate(_points: IdwPoint[], _o: IdwOptions, _powers: number[] = [1, 1.5, 2, 2.5, 3]): CrossValidationResult {
  throw new Error('not implemented');
}

export function nextTestSpots(_points: IdwPoint[], _grid: GridSpec, _mask: Uint8Array, _count = 5, _o?: IdwOptions): TestSpot[] {
  throw new Error('not implemented');
}
