import { z } from 'zod';
import { LENGTH_UNITS, lengthFromSi, lengthToSi, type LengthUnit } from '../units/length';
import { isoDateTime } from './common';
import { epsgCodeSchema, type DisplayUnits } from './sites';

export const AQUIFER_CONDITIONS = ['confined', 'unconfined', 'leaky'] as const;
export const aquiferConditionSchema = z.enum(AQUIFER_CONDITIONS, { error: 'Choose confined, unconfined or leaky' });
export type AquiferCondition = z.infer<typeof aquiferConditionSchema>;

export const WELL_STATUSES = ['active', 'inactive', 'decommissioned'] as const;
export const wellStatusSchema = z.enum(WELL_STATUSES, { error: 'Choose active, inactive or decommissioned' });
export type WellStatus = z.infer<typeof wellStatusSchema>;

export const INTAKE_RADII = ['screen', 'borehole'] as const;
/** Which radius is the intake's (Hvorslev's R, Bouwer-Rice's rw): the screen, or the borehole (filter pack). */
export const intakeRadiusSchema = z.enum(INTAKE_RADII, { error: 'Intake radius must be the screen or the borehole' });
export type IntakeRadius = z.infer<typeof intakeRadiusSchema>;
/**
 * The intake of a new well when none is chosen: the borehole where a filter pack surrounds the
 * screen (borehole radius larger than the screen's), as where the pack is more permeable than the
 * formation (common practice); the screen otherwise.
 */
export function defaultIntakeRadius(screenRadiusM: number, boreholeRadiusM: number): IntakeRadius {
  return boreholeRadiusM > screenRadiusM ? 'borehole' : 'screen';
}

export const SCREEN_REFERENCES = ['depth', 'elevation'] as const;
/** Screen top and bottom entered as depths below ground or as elevations. */
export const screenReferenceSchema = z.enum(SCREEN_REFERENCES, { error: 'Choose depth below ground or elevation' });
export type ScreenReference = z.infer<typeof screenReferenceSchema>;

export const LENGTH_UNIT_IDS = LENGTH_UNITS.map((u) => u.id) as [LengthUnit, ...LengthUnit[]];
export const lengthUnitSchema = z.enum(LENGTH_UNIT_IDS, { error: 'Choose a length unit: m, cm, mm, ft or in' });

/** Latitude/longitude on WGS 84 as an EPSG code; projected and other geographic systems use their own. */
export const WGS84_EPSG = 4326;

/** Bounds that catch a wrong unit or a diameter typed as a radius. */
export const MAX_RADIUS_M = 1;
export const MP_BELOW_GROUND_MAX_M = 1;
export const MP_ABOVE_GROUND_MAX_M = 3;

const numberSchema = (label: string) =>
  z.number({ error: (iss) => (iss.input === undefined || iss.input === null || iss.input === '' ? `${label} is required` : `${label} must be a number`) });

const lengthSchema = (label: string) => z.object({ value: numberSchema(label), unit: lengthUnitSchema });
const optionalLengthSchema = (label: string) =>
  z.object({ value: numberSchema(label).nullable(), unit: lengthUnitSchema }).nullable().optional();
export type LengthValue = { value: number; unit: LengthUnit };
export type OptionalLengthValue = { value: number | null; unit: LengthUnit } | null | undefined;

export const wellNameSchema = z
  .string({ error: 'Name is required' })
  .trim()
  .min(1, 'Name is required')
  .max(80, 'Name must be at most 80 characters');

export const coordinatesSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({
      kind: z.literal('epsg'),
      epsg: epsgCodeSchema,
      x: numberSchema('Easting (x)'),
      y: numberSchema('Northing (y)'),
    }),
    z.object({
      kind: z.literal('latlon'),
      lat: numberSchema('Latitude').min(-90, 'Latitude must be between −90 and 90').max(90, 'Latitude must be between −90 and 90'),
      lon: numberSchema('Longitude').min(-180, 'Longitude must be between −180 and 180').max(180, 'Longitude must be between −180 and 180'),
    }),
  ],
  { error: 'Choose coordinates in an EPSG system or as latitude/longitude' },
);
export type CoordinatesInput = z.infer<typeof coordinatesSchema>;

/** The well's fields as a user enters them: every length with its own unit. No defaults, no cross-field checks. */
const wellFieldsBase = z.object({
  name: wellNameSchema,
  coordinates: coordinatesSchema,
  groundElevation: lengthSchema('Ground elevation'),
  measuringPointElevation: lengthSchema('Measuring-point elevation'),
  screenReference: screenReferenceSchema,
  screenTop: lengthSchema('Screen top'),
  screenBottom: lengthSchema('Screen bottom'),
  casingRadius: lengthSchema('Casing radius'),
  screenRadius: lengthSchema('Screen radius'),
  boreholeRadius: lengthSchema('Borehole radius'),
  /** Omitted on a new well: the borehole where it is larger than the screen, else the screen. */
  intakeRadius: intakeRadiusSchema.optional(),
  filterPackPorosity: numberSchema('Filter-pack porosity')
    .gt(0, 'Filter-pack porosity must be between 0 and 1 (exclusive)')
    .lt(1, 'Filter-pack porosity must be between 0 and 1 (exclusive)')
    .nullable()
    .optional(),
  hydroUnit: z.string({ error: 'Hydrostratigraphic unit must be text' }).trim().max(80, 'Hydrostratigraphic unit must be at most 80 characters').nullable().optional(),
  aquiferCondition: aquiferConditionSchema,
  saturatedThickness: optionalLengthSchema('Saturated thickness'),
  staticWaterDepth: optionalLengthSchema('Static water depth'),
  staticToScreenBottom: optionalLengthSchema('Static level to screen bottom'),
  status: wellStatusSchema,
  notes: z.string({ error: 'Notes must be text' }).max(4000, 'Notes must be at most 4000 characters'),
});

/** A whole well: status and notes may be left out. */
export const wellFieldsSchema = wellFieldsBase.extend({
  status: wellFieldsBase.shape.status.default('active'),
  notes: wellFieldsBase.shape.notes.default(''),
});
export type WellFields = z.input<typeof wellFieldsSchema>;

/** Construction in SI, derived from the input; what the database stores. */
export interface WellConstructionSi {
  groundElevationM: number;
  measuringPointElevationM: number;
  screenTopDepthM: number;
  screenBottomDepthM: number;
  screenTopElevationM: number;
  screenBottomElevationM: number;
  casingRadiusM: number;
  screenRadiusM: number;
  boreholeRadiusM: number;
  filterPackPorosity: number | null;
  saturatedThicknessM: number | null;
  /** Below the measuring point. */
  staticWaterDepthM: number | null;
  /** Lw: as given, or derived from the static water depth. */
  staticToScreenBottomM: number | null;
}

const si = (l: LengthValue) => lengthToSi(l.value, l.unit);
const siOrNull = (l: OptionalLengthValue) => (l && l.value !== null && l.value !== undefined ? lengthToSi(l.value, l.unit) : null);

/** Lw from the static water depth below the measuring point: static water elevation minus screen bottom elevation. */
export function derivedStaticToScreenBottomM(measuringPointElevationM: number, staticWaterDepthM: number, screenBottomElevationM: number): number {
  return measuringPointElevationM - staticWaterDepthM - screenBottomElevationM;
}

type ConstructionInput = Pick<
  z.output<typeof wellFieldsSchema>,
  'aquiferCondition' | 'groundElevation' | 'measuringPointElevation' | 'screenReference' | 'screenTop' | 'screenBottom' | 'casingRadius' | 'screenRadius' | 'boreholeRadius' | 'filterPackPorosity' | 'saturatedThickness' | 'staticWaterDepth' | 'staticToScreenBottom'
>;

export function wellConstructionToSi(v: ConstructionInput): WellConstructionSi {
  const groundElevationM = si(v.groundElevation);
  const measuringPointElevationM = si(v.measuringPointElevation);
  const top = si(v.screenTop);
  const bottom = si(v.screenBottom);
  const byDepth = v.screenReference === 'depth';
  const screenTopDepthM = byDepth ? top : groundElevationM - top;
  const screenBottomDepthM = byDepth ? bottom : groundElevationM - bottom;
  const screenTopElevationM = byDepth ? groundElevationM - top : top;
  const screenBottomElevationM = byDepth ? groundElevationM - bottom : bottom;
  const staticWaterDepthM = siOrNull(v.staticWaterDepth);
  const givenLw = siOrNull(v.staticToScreenBottom);
  return {
    groundElevationM,
    measuringPointElevationM,
    screenTopDepthM,
    screenBottomDepthM,
    screenTopElevationM,
    screenBottomElevationM,
    casingRadiusM: si(v.casingRadius),
    screenRadiusM: si(v.screenRadius),
    boreholeRadiusM: si(v.boreholeRadius),
    filterPackPorosity: v.filterPackPorosity ?? null,
    saturatedThicknessM: siOrNull(v.saturatedThickness),
    staticWaterDepthM,
    staticToScreenBottomM:
      givenLw ?? (staticWaterDepthM === null ? null : derivedStaticToScreenBottomM(measuringPointElevationM, staticWaterDepthM, screenBottomElevationM)),
  };
}

const fmtM = (m: number) => `${Number(m.toFixed(3))} m`;

/** The construction checks, each naming the field it is about. */
export function checkWellConstruction(v: ConstructionInput, issue: (path: string, message: string) => void): void {
  const c = wellConstructionToSi(v);
  const byDepth = v.screenReference === 'depth';
  if (!(c.screenBottomDepthM > c.screenTopDepthM)) {
    issue('screenBottom', byDepth ? 'Screen bottom must be below the screen top (a greater depth)' : 'Screen bottom must be below the screen top (a lower elevation)');
  }
  if (c.screenTopDepthM < 0) {
    issue('screenTop', byDepth ? 'Screen top depth cannot be negative: depths are measured down from the ground surface' : `Screen top must be at or below the ground surface (${fmtM(-c.screenTopDepthM)} above it)`);
  }
  const stickup = c.measuringPointElevationM - c.groundElevationM;
  if (stickup > MP_ABOVE_GROUND_MAX_M || stickup < -MP_BELOW_GROUND_MAX_M) {
    issue(
      'measuringPointElevation',
      `Measuring point (top of casing) must be within ${MP_BELOW_GROUND_MAX_M} m below to ${MP_ABOVE_GROUND_MAX_M} m above the ground surface; it is ${fmtM(Math.abs(stickup))} ${stickup > 0 ? 'above' : 'below'} it`,
    );
  }
  const radii = [
    ['casingRadius', 'Casing radius', c.casingRadiusM],
    ['screenRadius', 'Screen radius', c.screenRadiusM],
    ['boreholeRadius', 'Borehole radius', c.boreholeRadiusM],
  ] as const;
  for (const [path, label, r] of radii) {
    if (!(r > 0)) issue(path, `${label} must be greater than zero`);
    else if (r > MAX_RADIUS_M) issue(path, `${label} must be at most ${MAX_RADIUS_M} m (${fmtM(r)} entered: is it a diameter, or in another unit?)`);
  }
  if (c.screenRadiusM > 0 && c.boreholeRadiusM > 0 && c.boreholeRadiusM < c.screenRadiusM) {
    issue('boreholeRadius', 'Borehole radius must be at least the screen radius');
  }
  if (c.staticWaterDepthM !== null) {
    if (c.staticWaterDepthM < 0) issue('staticWaterDepth', 'Static water depth is measured down from the measuring point and cannot be negative');
    else if (c.screenBottomDepthM > c.screenTopDepthM && c.measuringPointElevationM - c.staticWaterDepthM <= c.screenBottomElevationM) {
      issue('staticWaterDepth', 'Static water level must be above the screen bottom (the screen would be dry)');
    }
  }
  const givenLw = siOrNull(v.staticToScreenBottom);
  if (givenLw !== null && !(givenLw > 0)) issue('staticToScreenBottom', 'Static level to screen bottom must be greater than zero');
  if (c.saturatedThicknessM !== null) {
    if (!(c.saturatedThicknessM > 0)) issue('saturatedThickness', 'Saturated thickness must be greater than zero');
    // Bouwer and Rice measure both from the water table of an unconfined aquifer: Lw ≤ D.
    else if (v.aquiferCondition === 'unconfined' && c.staticToScreenBottomM !== null && c.staticToScreenBottomM > 0 && c.saturatedThicknessM < c.staticToScreenBottomM - 1e-9) {
      issue('saturatedThickness', `Saturated thickness must be at least the static level to screen bottom distance (${fmtM(c.staticToScreenBottomM)})`);
    }
  }
}

/** The hydrostratigraphic unit must be one of the site's; matched without regard to case. */
export function matchHydroUnit(siteUnits: readonly string[], value: string | null | undefined): { ok: true; unit: string | null } | { ok: false; message: string } {
  const v = (value ?? '').trim();
  if (v === '') return { ok: true, unit: null };
  const found = siteUnits.find((u) => u.toLowerCase() === v.toLowerCase());
  if (found) return { ok: true, unit: found };
  return {
    ok: false,
    message: siteUnits.length
      ? `Hydrostratigraphic unit "${v}" is not one of this site's: ${siteUnits.join(', ')}`
      : `Hydrostratigraphic unit "${v}" is not defined: this site has no units yet (a Lead adds them in the site settings)`,
  };
}

const refineWell = (siteUnits?: readonly string[]) => (v: z.output<typeof wellFieldsSchema>, ctx: z.RefinementCtx) => {
  checkWellConstruction(v, (path, message) => ctx.addIssue({ code: 'custom', path: [path], message }));
  if (siteUnits) {
    const m = matchHydroUnit(siteUnits, v.hydroUnit);
    if (!m.ok) ctx.addIssue({ code: 'custom', path: ['hydroUnit'], message: m.message });
  }
};

/** A new well (POST): fields plus the construction checks. The site's unit list is checked by the server. */
export const wellInputSchema = wellFieldsSchema.superRefine(refineWell());
export type WellInput = z.input<typeof wellInputSchema>;
export type WellInputParsed = z.output<typeof wellInputSchema>;

/** The form's schema: the same checks and the site's list of hydrostratigraphic units. */
export const wellFormSchemaFor = (siteUnits: readonly string[]) => wellFieldsSchema.superRefine(refineWell(siteUnits));

/** A change (PATCH): any subset of the fields; the merged well is checked as a whole. */
export const wellPatchSchema = wellFieldsBase.partial();
export type WellPatch = z.input<typeof wellPatchSchema>;

/** A stored well, in SI: lengths in metres, depths below ground unless named otherwise. */
export const wellSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  name: z.string(),
  /** The EPSG code the coordinates were entered in (4326: latitude/longitude). */
  inputEpsg: z.number(),
  inputX: z.number(),
  inputY: z.number(),
  lon: z.number(),
  lat: z.number(),
  /** In the site's coordinate reference system. */
  siteX: z.number(),
  siteY: z.number(),
  groundElevationM: z.number(),
  measuringPointElevationM: z.number(),
  screenTopDepthM: z.number(),
  screenBottomDepthM: z.number(),
  screenTopElevationM: z.number(),
  screenBottomElevationM: z.number(),
  screenLengthM: z.number(),
  casingRadiusM: z.number(),
  screenRadiusM: z.number(),
  boreholeRadiusM: z.number(),
  /** The radius every new fit of this well takes as the intake, unless the fit overrides it. */
  intakeRadius: intakeRadiusSchema,
  filterPackPorosity: z.number().nullable(),
  hydroUnit: z.string().nullable(),
  aquiferCondition: aquiferConditionSchema,
  saturatedThicknessM: z.number().nullable(),
  staticWaterDepthM: z.number().nullable(),
  staticToScreenBottomM: z.number().nullable(),
  /** True when Lw was derived from the static water depth rather than entered. */
  staticToScreenBottomDerived: z.boolean(),
  status: wellStatusSchema,
  notes: z.string(),
  isDemo: z.boolean(),
  createdAt: isoDateTime,
  updatedAt: isoDateTime,
});
export type Well = z.infer<typeof wellSchema>;
export const wellListSchema = z.object({ wells: z.array(wellSchema) });

/** A stored well as form input, in metres and as entered coordinates; used to edit and to merge a PATCH. */
export function wellToInput(
  w: Well,
  unitFor: (group: LengthGroup) => LengthUnit = () => 'm',
  screenReference: ScreenReference = 'depth',
): z.output<typeof wellFieldsSchema> {
  const byDepth = screenReference === 'depth';
  const len = (m: number, group: LengthGroup) => {
    const unit = unitFor(group);
    return { value: roundForInput(lengthFromSi(m, unit)), unit };
  };
  const opt = (m: number | null, group: LengthGroup) => (m === null ? null : len(m, group));
  return {
    name: w.name,
    coordinates: w.inputEpsg === WGS84_EPSG ? { kind: 'latlon', lat: w.inputY, lon: w.inputX } : { kind: 'epsg', epsg: w.inputEpsg, x: w.inputX, y: w.inputY },
    groundElevation: len(w.groundElevationM, 'elevation'),
    measuringPointElevation: len(w.measuringPointElevationM, 'elevation'),
    screenReference,
    screenTop: byDepth ? len(w.screenTopDepthM, 'depth') : len(w.screenTopElevationM, 'elevation'),
    screenBottom: byDepth ? len(w.screenBottomDepthM, 'depth') : len(w.screenBottomElevationM, 'elevation'),
    casingRadius: len(w.casingRadiusM, 'radius'),
    screenRadius: len(w.screenRadiusM, 'radius'),
    boreholeRadius: len(w.boreholeRadiusM, 'radius'),
    intakeRadius: w.intakeRadius,
    filterPackPorosity: w.filterPackPorosity,
    hydroUnit: w.hydroUnit,
    aquiferCondition: w.aquiferCondition,
    saturatedThickness: opt(w.saturatedThicknessM, 'depth'),
    staticWaterDepth: opt(w.staticWaterDepthM, 'depth'),
    staticToScreenBottom: w.staticToScreenBottomDerived ? null : opt(w.staticToScreenBottomM, 'depth'),
    status: w.status,
    notes: w.notes,
  };
}

/** Conversions back from SI leave float noise (0.30479999…); 10 significant digits hide it and keep every entered digit. */
export function roundForInput(v: number): number {
  return Number(v.toPrecision(10));
}

/** Length groups: one unit each in the table, the export and the CSV import. */
export const LENGTH_GROUPS = ['elevation', 'depth', 'radius'] as const;
export type LengthGroup = (typeof LENGTH_GROUPS)[number];
export const LENGTH_GROUP_LABELS: Record<LengthGroup, string> = {
  elevation: 'Elevations',
  depth: 'Depths, thickness and water levels',
  radius: 'Radii',
};

/** The site's display units: SI in metres throughout; US customary in feet, with radii in inches. */
export function displayLengthUnit(units: DisplayUnits, group: LengthGroup): LengthUnit {
  if (units === 'SI') return 'm';
  return group === 'radius' ? 'in' : 'ft';
}
