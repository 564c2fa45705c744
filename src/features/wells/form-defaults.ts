import type { DefaultValues } from 'react-hook-form';
import type { Site } from '@shared/schemas/sites';
import { displayLengthUnit, wellToInput, type LengthGroup, type Well, type WellFields } from '@shared/schemas/wells';

type FormSite = Pick<Site, 'epsgCode' | 'displayUnits'>;
const OPTIONAL = ['saturatedThickness', 'staticWaterDepth', 'staticToScreenBottom'] as const;

/** A new well: the site's system and display units, everything else empty. */
export function newWellDefaults(site: FormSite): DefaultValues<WellFields> {
  const unit = (g: LengthGroup) => ({ value: null as unknown as number, unit: displayLengthUnit(site.displayUnits, g) });
  return {
    name: '',
    coordinates: { kind: 'epsg', epsg: site.epsgCode },
    groundElevation: unit('elevation'),
    measuringPointElevation: unit('elevation'),
    screenReference: 'depth',
    screenTop: unit('depth'),
    screenBottom: unit('depth'),
    casingRadius: unit('radius'),
    screenRadius: unit('radius'),
    boreholeRadius: unit('radius'),
    // Where a filter pack surrounds the screen its outer radius is the usual intake (decision 012).
    intakeRadius: 'borehole',
    filterPackPorosity: null,
    hydroUnit: '',
    aquiferCondition: 'unconfined',
    saturatedThickness: { value: null, unit: displayLengthUnit(site.displayUnits, 'depth') },
    staticWaterDepth: { value: null, unit: displayLengthUnit(site.displayUnits, 'depth') },
    staticToScreenBottom: { value: null, unit: displayLengthUnit(site.displayUnits, 'depth') },
    status: 'active',
    notes: '',
  };
}

/** A stored well as the form shows it, in the site's display units. */
export function editWellDefaults(well: Well, site: FormSite): DefaultValues<WellFields> {
  const input = wellToInput(well, (g) => displayLengthUnit(site.displayUnits, g));
  const out: WellFields = { ...input, hydroUnit: input.hydroUnit ?? '' };
  for (const k of OPTIONAL) out[k] ??= { value: null, unit: displayLengthUnit(site.displayUnits, 'depth') };
  return out;
}
