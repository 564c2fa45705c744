import type { Fit } from '@shared/schemas/fits';

export const FIT_ID = '11111111-1111-4111-8111-111111111111';
export const at = '2026-11-20T10:00:00.000Z';

/** A stored fit as the API sends it, awaiting check unless overridden. */
export function fit(over: Partial<Fit> = {}): Fit {
  return {
    id: FIT_ID,
    siteId: 's1',
    wellId: 'w1',
    wellName: 'MW-03',
    recordId: 'r1',
    chainId: FIT_ID,
    revision: 1,
    status: 'awaiting-check',
    supersededAt: null,
    method: 'hvorslev',
    model: 'line',
    line: 'anchored',
    windowInput: null,
    geometry: { casingRadiusM: 0.0254, screenRadiusM: 0.0508, screenLengthM: 3, intake: 'screen', anisotropyRatio: 1 },
    options: { allowOscillation: false },
    note: '',
    result: {
      slopePerSecond: -0.01,
      intercept: 0,
      t0Seconds: 100,
      rSquared: 0.999,
      count: 12,
      window: { source: 'recommended', fromSeconds: 140, toSeconds: 190, headMax: 0.25, headMin: 0.15, count: 12 },
      h0M: 0.5,
      effectiveH0M: 0.5,
      expectedH0M: null,
      lineCrossingSeconds: 100,
      recordCrossingSeconds: 100,
      kMetersPerSecond: 1.2e-5,
      kSimplifiedMetersPerSecond: 1.2e-5,
      casingRadiusUsedM: 0.0254,
      casingRadiusIsEffective: false,
      lineReference: 'line',
      kReference: 'k',
    },
    flags: [],
    flagReasons: {},
    resolvedFlags: [],
    preparedBy: { id: 'u-analyst', name: 'Tomas Ferreira' },
    checkedBy: null,
    checkComment: null,
    submittedAt: at,
    checkedAt: null,
    createdAt: at,
    updatedAt: at,
    can: { edit: false, revise: false, submit: false, check: true },
    ...over,
  };
}

