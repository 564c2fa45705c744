import { isLengthUnit, type LengthUnit } from '../units/length';
import { isPressureUnit, type PressureUnit } from '../units/pressure';
import type { TimeUnit } from '../units/time';

export type RecognisedUnit =
  | { quantity: 'length'; id: LengthUnit }
  | { quantity: 'pressure'; id: PressureUnit }
  | { quantity: 'time'; id: TimeUnit };

const ALIASES: Readonly<Record<string, RecognisedUnit>> = {
  m: { quantity: 'length', id: 'm' },
  meter: { quantity: 'length', id: 'm' },
  meters: { quantity: 'length', id: 'm' },
  metre: { quantity: 'length', id: 'm' },
  metres: { quantity: 'length', id: 'm' },
  cm: { quantity: 'length', id: 'cm' },
  mm: { quantity: 'length', id: 'mm' },
  ft: { quantity: 'length', id: 'ft' },
  feet: { quantity: 'length', id: 'ft' },
  foot: { quantity: 'length', id: 'ft' },
  in: { quantity: 'length', id: 'in' },
  inch: { quantity: 'length', id: 'in' },
  inches: { quantity: 'length', id: 'in' },
  pa: { quantity: 'pressure', id: 'Pa' },
  kpa: { quantity: 'pressure', id: 'kPa' },
  psi: { quantity: 'pressure', id: 'psi' },
  psia: { quantity: 'pressure', id: 'psi' },
  psig: { quantity: 'pressure', id: 'psi' },
  mbar: { quantity: 'pressure', id: 'mbar' },
  mb: { quantity: 'pressure', id: 'mbar' },
  millibar: { quantity: 'pressure', id: 'mbar' },
  hpa: { quantity: 'pressure', id: 'hPa' },
  mh2o: { quantity: 'pressure', id: 'mH2O' },
  mwc: { quantity: 'pressure', id: 'mH2O' },
  mwater: { quantity: 'pressure', id: 'mH2O' },
  fth2o: { quantity: 'pressure', id: 'ftH2O' },
  ftwater: { quantity: 'pressure', id: 'ftH2O' },
  s: { quantity: 'time', id: 's' },
  sec: { quantity: 'time', id: 's' },
  secs: { quantity: 'time', id: 's' },
  second: { quantity: 'time', id: 's' },
  seconds: { quantity: 'time', id: 's' },
  min: { quantity: 'time', id: 'min' },
  mins: { quantity: 'time', id: 'min' },
  minute: { quantity: 'time', id: 'min' },
  minutes: { quantity: 'time', id: 'min' },
  h: { quantity: 'time', id: 'h' },
  hr: { quantity: 'time', id: 'h' },
  hrs: { quantity: 'time', id: 'h' },
  hour: { quantity: 'time', id: 'h' },
  hours: { quantity: 'time', id: 'h' },
  d: { quantity: 'time', id: 'd' },
  day: { quantity: 'time', id: 'd' },
  days: { quantity: 'time', id: 'd' },
};

/** A unit as loggers write it ("(psi)", "[m]", "ft H2O", "mbar") to Kfield's unit id, or null. */
export function recogniseUnit(written: string | null | undefined): RecognisedUnit | null {
  if (!written) return null;
  const key = written
    .trim()
    .replace(/^[[(<{]\s*|\s*[\])>}]$/g, '')
    .replace(/[\s_.]+/g, '')
    .replace(/₂/g, '2')
    .toLowerCase();
  return ALIASES[key] ?? null;
}

/** The unit written inside a column name: "Level (m)", "Pressure[psi]", "Depth, ft", "Level_ft". */
export function unitInName(name: string): string | null {
  const bracketed = /[[(]\s*([^\])]{1,16}?)\s*[\])]\s*$/.exec(name);
  if (bracketed) return bracketed[1];
  const suffix = /(?:,\s*|_|\/)([A-Za-z][A-Za-z0-9₂ ]{0,8})$/.exec(name);
  if (suffix && recogniseUnit(suffix[1]) && name.length > suffix[0].length) return suffix[1];
  return null;
}

export const isValueUnit = (unit: string): unit is LengthUnit | PressureUnit => isLengthUnit(unit) || isPressureUnit(unit);
