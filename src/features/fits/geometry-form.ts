import type { FitGeometry } from '@shared/schemas/fits';
import type { DisplayUnits } from '@shared/schemas/sites';
import type { FitMethod } from '@shared/hydraulics/fitting';
import { lengthFromSi, lengthToSi, type LengthUnit } from '@shared/units/length';

/** The geometry as typed: text in the site's units, so a half-typed number is not lost. */
export interface GeometryDraft {
  casingRadius: string;
  screenRadius: string;
  boreholeRadius: string;
  screenLength: string;
  intake: 'screen' | 'borehole';
  anisotropyRatio: string;
  inFilterPack: boolean;
  filterPackPorosity: string;
  staticToScreenBottom: string;
  saturatedThickness: string;
}

export type GeometryField = Exclude<keyof GeometryDraft, 'intake' | 'inFilterPack'>;
export type GeometryErrors = Partial<Record<GeometryField, string>>;

export interface GeometryUnits {
  radius: LengthUnit;
  length: LengthUnit;
}

/** Radii in centimetres or inches, lengths in metres or feet, as the site displays them. */
export function geometryUnitsFor(units: DisplayUnits): GeometryUnits {
  return units === 'US' ? { radius: 'in', length: 'ft' } : { radius: 'cm', length: 'm' };
}

/** Which fields are radii (the rest are lengths or plain numbers). */
const RADIUS_FIELDS = new Set<GeometryField>(['casingRadius', 'screenRadius', 'boreholeRadius']);
const LENGTH_FIELDS = new Set<GeometryField>(['screenLength', 'staticToScreenBottom', 'saturatedThickness']);

export function unitOfField(field: GeometryField, units: GeometryUnits): LengthUnit | null {
  if (RADIUS_FIELDS.has(field)) return units.radius;
  if (LENGTH_FIELDS.has(field)) return units.length;
  return null;
}

/** A stored SI length as the input shows it: six significant digits, no float noise (5.08, not 5.0800000001). */
export function displayValue(valueM: number | undefined | null, unit: LengthUnit): string {
  if (valueM === undefined || valueM === null || !Number.isFinite(valueM)) return '';
  return String(Number(lengthFromSi(valueM, unit).toPrecision(6)));
}

export function draftFromGeometry(g: Partial<FitGeometry>, units: GeometryUnits): GeometryDraft {
  return {
    casingRadius: displayValue(g.casingRadiusM, units.radius),
    screenRadius: displayValue(g.screenRadiusM, units.radius),
    boreholeRadius: displayValue(g.boreholeRadiusM, units.radius),
    screenLength: displayValue(g.screenLengthM, units.length),
    intake: g.intake ?? 'screen',
    anisotropyRatio: g.anisotropyRatio === undefined ? '1' : String(g.anisotropyRatio),
    inFilterPack: g.filterPackPorosity !== undefined,
    filterPackPorosity: g.filterPackPorosity === undefined ? '' : String(g.filterPackPorosity),
    staticToScreenBottom: displayValue(g.staticToScreenBottomM, units.length),
    saturatedThickness: displayValue(g.saturatedThicknessM, units.length),
  };
}

/** A typed number; a decimal comma is accepted. Empty gives undefined. */
export function parseNumber(text: string): number | undefined | 'invalid' {
  const t = text.trim().replace(',', '.');
  if (t === '') return undefined;
  const n = Number(t);
  return Number.isFinite(n) ? n : 'invalid';
}

const LABELS: Record<GeometryField, string> = {
  casingRadius: 'Casing radius',
  screenRadius: 'Screen radius',
  boreholeRadius: 'Borehole radius',
  screenLength: 'Screen length',
  anisotropyRatio: 'Anisotropy Kh/Kv',
  filterPackPorosity: 'Filter-pack porosity',
  staticToScreenBottom: 'Static level to screen bottom',
  saturatedThickness: 'Saturated thickness',
};

export function geometryFieldLabel(field: GeometryField): string {
  return LABELS[field];
}

/**
 * The draft in SI for the engine and the API, or the message beside each field that stops it.
 * Bouwer-Rice needs the static level to screen bottom and the saturated thickness; Hvorslev does not.
 */
export function geometryFromDraft(
  draft: GeometryDraft,
  units: GeometryUnits,
  method: FitMethod,
): { geometry: FitGeometry | null; errors: GeometryErrors } {
  const errors: GeometryErrors = {};
  const read = (field: GeometryField, required: boolean): number | undefined => {
    const n = parseNumber(draft[field]);
    if (n === 'invalid') {
      errors[field] = `${LABELS[field]} must be a number`;
      return undefined;
    }
    if (n === undefined) {
      if (required) errors[field] = `${LABELS[field]} is required`;
      return undefined;
    }
    if (!(n > 0)) {
      errors[field] = `${LABELS[field]} must be greater than 0`;
      return undefined;
    }
    const unit = unitOfField(field, units);
    return unit ? lengthToSi(n, unit) : n;
  };
  const casingRadiusM = read('casingRadius', true);
  const screenRadiusM = read('screenRadius', true);
  const boreholeRadiusM = read('boreholeRadius', draft.intake === 'borehole' || draft.inFilterPack);
  const screenLengthM = read('screenLength', true);
  const anisotropyRatio = read('anisotropyRatio', false) ?? 1;
  if (anisotropyRatio > 1000) errors.anisotropyRatio = 'Anisotropy Kh/Kv is at most 1000';
  let filterPackPorosity: number | undefined;
  if (draft.inFilterPack) {
    filterPackPorosity = read('filterPackPorosity', true);
    if (filterPackPorosity !== undefined && !(filterPackPorosity < 1)) {
      errors.filterPackPorosity = 'Filter-pack porosity must be below 1';
      filterPackPorosity = undefined;
    }
  }
  const bouwerRice = method === 'bouwer-rice';
  const staticToScreenBottomM = read('staticToScreenBottom', bouwerRice);
  const saturatedThicknessM = read('saturatedThickness', bouwerRice);
  if (screenRadiusM !== undefined && boreholeRadiusM !== undefined && screenRadiusM > boreholeRadiusM) {
    errors.boreholeRadius = 'Borehole radius must be at least the screen radius';
  }
  if (Object.keys(errors).length > 0 || casingRadiusM === undefined || screenRadiusM === undefined || screenLengthM === undefined) {
    return { geometry: null, errors };
  }
  const geometry: FitGeometry = { casingRadiusM, screenRadiusM, screenLengthM, intake: draft.intake, anisotropyRatio };
  if (boreholeRadiusM !== undefined) geometry.boreholeRadiusM = boreholeRadiusM;
  if (filterPackPorosity !== undefined) geometry.filterPackPorosity = filterPackPorosity;
  if (staticToScreenBottomM !== undefined) geometry.staticToScreenBottomM = staticToScreenBottomM;
  if (saturatedThicknessM !== undefined) geometry.saturatedThicknessM = saturatedThicknessM;
  return { geometry, errors };
}

/** A server or engine field name ("geometry.screenRadiusM") to the draft field it is about. */
export function geometryFieldOf(path: string): GeometryField | null {
  const key = path.replace(/^geometry\./, '');
  const map: Record<string, GeometryField> = {
    casingRadiusM: 'casingRadius',
    screenRadiusM: 'screenRadius',
    boreholeRadiusM: 'boreholeRadius',
    screenLengthM: 'screenLength',
    anisotropyRatio: 'anisotropyRatio',
    filterPackPorosity: 'filterPackPorosity',
    staticToScreenBottomM: 'staticToScreenBottom',
    saturatedThicknessM: 'saturatedThickness',
  };
  return path.startsWith('geometry.') ? (map[key] ?? null) : null;
}

/**
 * The high-K effective length L_e as typed (site length unit) in metres: empty gives undefined
 * (the fit starts from, or holds, the well's estimate); otherwise a positive number or the message.
 */
export function effectiveLengthFromDraft(text: string, unit: LengthUnit): { valueM?: number; error?: string } {
  const n = parseNumber(text);
  if (n === undefined) return {};
  if (n === 'invalid') return { error: 'Effective length L_e must be a number' };
  if (!(n > 0)) return { error: 'Effective length L_e must be greater than 0' };
  const valueM = lengthToSi(n, unit);
  if (valueM > 1000) return { error: 'Effective length L_e is at most 1000 m' };
  return { valueM };
}
