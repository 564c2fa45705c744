import { z } from 'zod';
import { isoDateTime } from './common';

export const FIT_STATUSES = ['draft', 'awaiting-check', 'checked', 'sent-back'] as const;
export const fitStatusSchema = z.enum(FIT_STATUSES);
export type FitStatus = z.infer<typeof fitStatusSchema>;
/** Product names of the states, for every screen and e-mail. */
export const FIT_STATUS_LABELS: Record<FitStatus, string> = {
  draft: 'Draft',
  'awaiting-check': 'Awaiting check',
  checked: 'Checked',
  'sent-back': 'Sent back',
};

const positive = (what: string) =>
  z.number({ error: `${what} must be a number` }).finite(`${what} must be finite`).positive(`${what} must be greater than 0`);

export const fitWindowSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({
      kind: z.literal('time'),
      fromSeconds: z.number({ error: 'Window start must be a number of seconds' }).finite(),
      toSeconds: z.number({ error: 'Window end must be a number of seconds' }).finite(),
    }),
    z.object({
      kind: z.literal('head'),
      upper: z.number({ error: 'Upper H/H0 must be a number' }).finite().max(10, 'Upper H/H0 is at most 10'),
      lower: z.number({ error: 'Lower H/H0 must be a number' }).finite().gt(0, 'Lower H/H0 must be above 0: ln(H/H0) is undefined at or below 0'),
    }),
  ],
  { error: 'Window kind must be "time" or "head"' },
);
export type FitWindowInput = z.infer<typeof fitWindowSchema>;

/** Geometry used for one fit, in metres; pre-filled from the well, editable per fit. */
export const fitGeometrySchema = z.object({
  casingRadiusM: positive('Casing radius'),
  screenRadiusM: positive('Screen radius'),
  boreholeRadiusM: positive('Borehole radius').optional(),
  screenLengthM: positive('Screen length'),
  intake: z.enum(['screen', 'borehole'], { error: 'Intake radius must be the screen or the borehole' }).default('screen'),
  anisotropyRatio: positive('Anisotropy Kh/Kv').max(1000, 'Anisotropy Kh/Kv is at most 1000').default(1),
  /** Given only when the water level moves within the filter pack (effective casing radius). */
  filterPackPorosity: z.number().gt(0, 'Filter-pack porosity must be above 0').lt(1, 'Filter-pack porosity must be below 1').optional(),
  staticToScreenBottomM: positive('Static level to screen bottom').optional(),
  saturatedThicknessM: positive('Saturated thickness').optional(),
});
export type FitGeometry = z.infer<typeof fitGeometrySchema>;
/**
 * Geometry fields given on a new fit or a change: any subset, without defaults, so what is left out
 * comes from the well (a new fit) or stays as it was (a change) — the intake included.
 */
export const fitGeometryChangeSchema = fitGeometrySchema
  .extend({
    intake: fitGeometrySchema.shape.intake.unwrap(),
    anisotropyRatio: fitGeometrySchema.shape.anisotropyRatio.unwrap(),
  })
  .partial();

export const FIT_METHOD_IDS = ['hvorslev', 'bouwer-rice'] as const;
export const FIT_LINE_IDS = ['anchored', 'free'] as const;
/** The model fitted: the straight line of ln(H/H0) (overdamped), or the high-K model (docs/methods.md 6a). */
export const FIT_MODEL_IDS = ['line', 'high-k'] as const;
export type FitModel = (typeof FIT_MODEL_IDS)[number];
export const fitModelSchema = z.enum(FIT_MODEL_IDS, { error: 'Model must be "line" (straight line) or "high-k"' });

/** High-K settings: L_e fitted to the record (default) or held at the entered value (or the well's estimate). */
export const highKOptionsSchema = z.object({
  effectiveLengthM: positive('Effective length L_e').max(1000, 'Effective length L_e is at most 1000 m').optional(),
  fitEffectiveLength: z.boolean({ error: 'Fit L_e must be true or false' }).default(true),
});
export type HighKOptions = z.infer<typeof highKOptionsSchema>;

const fitOptionsSchema = z.object({
  allowOscillation: z.boolean().default(false),
  material: z.string().max(60).optional(),
  highK: highKOptionsSchema.optional(),
});

export const fitBodySchema = z.object({
  method: z.enum(FIT_METHOD_IDS, { error: 'Method must be Hvorslev or Bouwer-Rice' }),
  /** 'high-k': the high-K variant of the method (window and line do not apply). */
  model: fitModelSchema.default('line'),
  line: z.enum(FIT_LINE_IDS, { error: 'Line must be anchored or free' }).default('anchored'),
  /** Omitted: the method's recommended head range (or 0.05 < H/H0 ≤ 1). */
  window: fitWindowSchema.optional(),
  /** Omitted fields come from the well. */
  geometry: fitGeometryChangeSchema.default({}),
  options: fitOptionsSchema.default({ allowOscillation: false }),
  note: z.string().max(2000, 'Note must be at most 2000 characters').default(''),
});
export type FitBody = z.input<typeof fitBodySchema>;
/** A change to a fit: omitted fields stay; `window: null` returns to the method's default window. */
export const fitPatchSchema = z.object({
  method: fitBodySchema.shape.method.optional(),
  model: fitModelSchema.optional(),
  line: z.enum(FIT_LINE_IDS, { error: 'Line must be anchored or free' }).optional(),
  window: fitWindowSchema.nullable().optional(),
  geometry: fitGeometryChangeSchema.optional(),
  options: fitOptionsSchema.optional(),
  note: z.string().max(2000, 'Note must be at most 2000 characters').optional(),
  /** The code of the flag whose suggested action this change applies: recorded as resolved when the change answers it. */
  resolving: z.string().max(60).optional(),
});
export type FitPatch = z.input<typeof fitPatchSchema>;

/** Submit: a reason for each flag that changes K and is not answered by the fit (see shared/hydraulics/flag-answers.ts). */
export const submitBodySchema = z.object({
  reasons: z.record(z.string().max(60), z.string().trim().max(2000, 'A reason must be at most 2000 characters')).default({}),
});
export type SubmitBody = z.input<typeof submitBodySchema>;

export const qcFlagSchema = z.object({
  code: z.string(),
  severity: z.enum(['info', 'warning', 'error']),
  message: z.string(),
  values: z.record(z.string(), z.union([z.number(), z.string(), z.boolean(), z.null()])),
  suggestion: z.string().optional(),
  reference: z.string().optional(),
});

export const FIT_WINDOW_SOURCES = ['recommended', 'fallback', 'entered', 'all-readings'] as const;

/**
 * The high-K fit's numbers. Its straight-line fields are filled so that lists, Well K and the map
 * read it like any fit: t0Seconds = C_D·√(L_e/g) (the equivalent time lag), slopePerSecond = −1/T0.
 */
export const fitHighKResultSchema = z.object({
  dampingParameter: z.number(),
  regime: z.enum(['underdamped', 'critically-damped', 'overdamped']),
  effectiveLengthM: z.number(),
  /** What the well's geometry gives for L_e; null when it cannot be estimated. */
  effectiveLengthEstimateM: z.number().nullable(),
  effectiveLengthFitted: z.boolean(),
  /** √(L_e/g), s. */
  timeScaleSeconds: z.number(),
  /** Underdamped only. */
  dampedPeriodSeconds: z.number().nullable(),
  /** √(SS_res/n) in H/H0. */
  residualRms: z.number(),
  timeOffsetSeconds: z.number(),
  /** Relative standard error of K from the fit; null when the record does not determine it. */
  kRelativeStandardError: z.number().nullable(),
});
export type FitHighKResult = z.infer<typeof fitHighKResultSchema>;

export const personRefSchema = z.object({ id: z.string(), name: z.string() });

export const fitSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  wellId: z.string(),
  wellName: z.string(),
  recordId: z.string(),
  /** Revisions of one fit share a chain id (the first revision's id). */
  chainId: z.string(),
  revision: z.number().int(),
  status: fitStatusSchema,
  /** Set when a later revision of the same chain has been Checked. */
  supersededAt: isoDateTime.nullable(),
  method: z.enum(FIT_METHOD_IDS),
  model: fitModelSchema,
  line: z.enum(FIT_LINE_IDS),
  windowInput: fitWindowSchema.nullable(),
  geometry: fitGeometrySchema,
  options: z.object({
    allowOscillation: z.boolean(),
    material: z.string().optional(),
    highK: z.object({ effectiveLengthM: z.number().optional(), fitEffectiveLength: z.boolean() }).optional(),
  }),
  note: z.string(),
  result: z.object({
    slopePerSecond: z.number(),
    intercept: z.number(),
    t0Seconds: z.number(),
    rSquared: z.number(),
    count: z.number().int(),
    window: z.object({
      /** 'all-readings': a high-K fit, over every reading from the test start. */
      source: z.enum(FIT_WINDOW_SOURCES),
      fromSeconds: z.number(),
      toSeconds: z.number(),
      headMax: z.number(),
      headMin: z.number(),
      count: z.number().int(),
    }),
    h0M: z.number(),
    effectiveH0M: z.number(),
    expectedH0M: z.number().nullable(),
    lineCrossingSeconds: z.number(),
    recordCrossingSeconds: z.number().nullable(),
    kMetersPerSecond: z.number(),
    kSimplifiedMetersPerSecond: z.number().nullable(),
    casingRadiusUsedM: z.number(),
    casingRadiusIsEffective: z.boolean(),
    lineReference: z.string(),
    kReference: z.string(),
    /** A high-K fit's own numbers; absent or null for a straight-line fit. */
    highK: fitHighKResultSchema.nullable().optional(),
  }),
  flags: z.array(qcFlagSchema),
  /** The analyst's reasons for keeping the fit as it is despite a flag that changes K, by flag code. */
  flagReasons: z.record(z.string(), z.string()),
  /** Flags resolved by applying their suggested action, no longer raised by the fit. */
  resolvedFlags: z.array(z.object({ code: z.string(), message: z.string(), action: z.string(), by: personRefSchema, at: isoDateTime })),
  preparedBy: personRefSchema,
  checkedBy: personRefSchema.nullable(),
  checkComment: z.string().nullable(),
  submittedAt: isoDateTime.nullable(),
  checkedAt: isoDateTime.nullable(),
  createdAt: isoDateTime,
  updatedAt: isoDateTime,
  /** What the caller may do now (the server enforces the same rules). */
  can: z.object({ edit: z.boolean(), revise: z.boolean(), submit: z.boolean(), check: z.boolean() }),
});
export type Fit = z.infer<typeof fitSchema>;
export const fitListSchema = z.object({ fits: z.array(fitSchema) });

export const checkBodySchema = z
  .object({
    decision: z.enum(['checked', 'sent-back'], { error: 'Decision must be "checked" or "sent-back"' }),
    comment: z.string().trim().max(4000, 'Comment must be at most 4000 characters').default(''),
  })
  .refine((b) => b.decision !== 'sent-back' || b.comment.length > 0, {
    path: ['comment'],
    message: 'Say what to change when sending a fit back',
  });
export type CheckBody = z.input<typeof checkBodySchema>;

export const FIT_EVENT_KINDS = ['created', 'parameters-changed', 'submitted', 'checked', 'sent-back', 'revision-started', 'superseded'] as const;
export const fitEventSchema = z.object({
  id: z.string(),
  fitId: z.string(),
  kind: z.enum(FIT_EVENT_KINDS),
  actor: personRefSchema.nullable(),
  at: isoDateTime,
  /** For parameter changes: field → { from, to }; for checks: the comment. */
  details: z.record(z.string(), z.unknown()),
});
export type FitEvent = z.infer<typeof fitEventSchema>;
export const fitAuditSchema = z.object({ events: z.array(fitEventSchema) });

export const wellKSchema = z.object({
  wellId: z.string(),
  /** Null while the well has no Checked fit. */
  kMetersPerSecond: z.number().nullable(),
  count: z.number().int(),
  log10Mean: z.number().nullable(),
  log10StdDev: z.number().nullable(),
  reference: z.string(),
  fits: z.array(z.object({ fitId: z.string(), recordId: z.string(), method: z.enum(FIT_METHOD_IDS), kMetersPerSecond: z.number(), checkedAt: isoDateTime })),
});
export type WellKDto = z.infer<typeof wellKSchema>;

export const checkQueueItemSchema = z.object({
  fitId: z.string(),
  siteId: z.string(),
  siteName: z.string(),
  wellId: z.string(),
  wellName: z.string(),
  recordId: z.string(),
  method: z.enum(FIT_METHOD_IDS),
  kMetersPerSecond: z.number(),
  revision: z.number().int(),
  preparedBy: personRefSchema,
  submittedAt: isoDateTime,
  flagCount: z.number().int(),
});
export const checkQueueSchema = z.object({ items: z.array(checkQueueItemSchema) });

/** GET /api/records/:recordId/reduced: the reduced series the workspace's in-browser preview runs on. */
export const reducedRecordSchema = z.object({
  recordId: z.string(),
  wellId: z.string(),
  siteId: z.string(),
  reference: z.enum(['depth', 'vented', 'absolute']),
  testType: z.enum(['rising-head', 'falling-head']),
  staticLevelM: z.number(),
  staticSource: z.enum(['entered', 'pre-test']),
  preTestCount: z.number().int(),
  testStartSeconds: z.number(),
  testStartIndex: z.number().int(),
  testStartSource: z.enum(['entered', 'detected']),
  h0M: z.number(),
  /** Readings of the whole record. */
  readings: z.number().int(),
  /** True when the arrays below hold fewer readings than the record. */
  decimated: z.boolean(),
  elapsedSeconds: z.array(z.number()),
  displacementM: z.array(z.number()),
  normalizedHead: z.array(z.number()),
  slugVolumeM3: z.number().nullable(),
  defaultGeometry: fitGeometrySchema,
  hydroUnit: z.string().nullable(),
});
export type ReducedRecordDto = z.infer<typeof reducedRecordSchema>;
