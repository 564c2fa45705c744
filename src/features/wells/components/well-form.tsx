import { useId, useState, type ReactNode } from 'react';
import { get, useForm, type DefaultValues, type Path, type UseFormRegister, type FieldErrors } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { Site } from '@shared/schemas/sites';
import {
  AQUIFER_CONDITIONS,
  LENGTH_UNIT_IDS,
  WELL_STATUSES,
  wellFormSchemaFor,
  type WellFields,
  type WellInputParsed,
} from '@shared/schemas/wells';
import { Button } from '@/components/ui/button';
import { FieldError, SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { applyServerErrors } from '@/lib/form-errors';
import { cn } from '@/lib/cn';
import { STATUS_LABELS } from './well-status';

type FormSite = Pick<Site, 'epsgCode' | 'crsName' | 'hydroUnits' | 'displayUnits'>;
type CoordinateMode = 'site' | 'other' | 'latlon';

const TOP_FIELDS = new Set([
  'name', 'coordinates', 'groundElevation', 'measuringPointElevation', 'screenReference', 'screenTop', 'screenBottom', 'casingRadius',
  'screenRadius', 'boreholeRadius', 'intakeRadius', 'filterPackPorosity', 'hydroUnit', 'aquiferCondition', 'saturatedThickness', 'staticWaterDepth',
  'staticToScreenBottom', 'status', 'notes',
]);

/** Server fields ("screenBottom", "groundElevation.value", "coordinates.epsg") are this form's paths. */
function mapWellField(serverField: string): Path<WellFields> | null {
  return TOP_FIELDS.has(serverField.split('.')[0]) ? (serverField as Path<WellFields>) : null;
}

/** Empty is "not given"; a decimal comma is read as a point. */
const asNumber = (v: unknown) => {
  if (v === '' || v === null || v === undefined) return null;
  if (typeof v === 'number') return v;
  return Number(String(v).trim().replace(',', '.'));
};

const messageAt = (errors: FieldErrors<WellFields>, ...paths: string[]): string | undefined => {
  for (const p of paths) {
    const m = (get(errors, p) as { message?: string } | undefined)?.message;
    if (m) return m;
  }
  return undefined;
};

function LengthInput({
  name,
  label,
  hint,
  register,
  errors,
  optional = false,
}: {
  name: 'groundElevation' | 'measuringPointElevation' | 'screenTop' | 'screenBottom' | 'casingRadius' | 'screenRadius' | 'boreholeRadius' | 'saturatedThickness' | 'staticWaterDepth' | 'staticToScreenBottom';
  label: string;
  hint?: ReactNode;
  register: UseFormRegister<WellFields>;
  errors: FieldErrors<WellFields>;
  optional?: boolean;
}) {
  const id = useId();
  const error = messageAt(errors, name, `${name}.value`, `${name}.unit`);
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium text-slate-800">
        {label}
        {optional ? <span className="ml-1 font-normal text-slate-500">(optional)</span> : null}
      </label>
      <div className="flex gap-2">
        <input
          id={id}
          inputMode="decimal"
          autoComplete="off"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined}
          className="block w-full min-w-0 rounded-md border-0 px-3 py-2 text-sm text-slate-900 shadow-sm ring-1 ring-slate-300 ring-inset focus-visible:outline-2 focus-visible:outline-accent-600 aria-[invalid=true]:ring-red-400"
          {...register(`${name}.value` as Path<WellFields>, { setValueAs: asNumber })}
        />
        <label htmlFor={`${id}-unit`} className="sr-only">
          {label} unit
        </label>
        <select
          id={`${id}-unit`}
          className="block w-20 shrink-0 rounded-md border-0 px-2 py-2 text-sm text-slate-900 shadow-sm ring-1 ring-slate-300 ring-inset"
          {...register(`${name}.unit` as Path<WellFields>)}
        >
          {LENGTH_UNIT_IDS.map((u) => (
            <option key={u} value={u}>
              {u}
            </option>
          ))}
        </select>
      </div>
      {hint && !error ? (
        <p id={`${id}-hint`} className="text-xs text-slate-500">
          {hint}
        </p>
      ) : null}
      <FieldError id={`${id}-error`} message={error} />
    </div>
  );
}

function Group({ title, children, className }: { title: string; children: ReactNode; className?: string }) {
  return (
    <fieldset className={cn('space-y-4 rounded-lg border border-slate-200 p-4', className)}>
      <legend className="px-1 text-sm font-semibold text-slate-900">{title}</legend>
      {children}
    </fieldset>
  );
}

type Props = {
  site: FormSite;
  defaultValues: DefaultValues<WellFields>;
  submitLabel: string;
  onSubmit: (body: WellInputParsed) => Promise<unknown>;
  onCancel?: () => void;
  /** Shows the name and area of use of the EPSG code being typed (from the sites feature). */
  renderCrsStatus?: (id: string, value: unknown) => ReactNode;
};

export function WellForm({ site, defaultValues, submitLabel, onSubmit, onCancel, renderCrsStatus }: Props) {
  const crsStatusId = useId();
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    watch,
    formState: { errors, isSubmitting },
  } = useForm<WellFields, unknown, WellInputParsed>({
    resolver: zodResolver(wellFormSchemaFor(site.hydroUnits)),
    defaultValues,
  });
  const initial = defaultValues.coordinates;
  const [mode, setMode] = useState<CoordinateMode>(
    initial?.kind === 'latlon' ? 'latlon' : initial?.kind === 'epsg' && initial.epsg !== undefined && Number(initial.epsg) !== site.epsgCode ? 'other' : 'site',
  );
  const screenReference = watch('screenReference');
  const otherEpsg = watch('coordinates.epsg' as Path<WellFields>);

  const chooseMode = (next: CoordinateMode) => {
    setMode(next);
    if (next === 'latlon') setValue('coordinates.kind', 'latlon');
    else {
      setValue('coordinates.kind', 'epsg');
      setValue('coordinates.epsg' as Path<WellFields>, next === 'site' ? site.epsgCode : ('' as never));
    }
  };

  const submit = handleSubmit(async (body) => {
    try {
      await onSubmit(body);
    } catch (error) {
      applyServerErrors(error, setError, mapWellField);
    }
  });

  const screenWord = screenReference === 'elevation' ? 'elevation' : 'depth below ground';

  return (
    <form onSubmit={submit} noValidate className="space-y-5">
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Well name" autoComplete="off" error={errors.name?.message} {...register('name')} />
        <SelectField label="Status" error={errors.status?.message} {...register('status')}>
          {WELL_STATUSES.map((s) => (
            <option key={s} value={s}>
              {STATUS_LABELS[s]}
            </option>
          ))}
        </SelectField>
      </div>

      <Group title="Location">
        <SelectField label="Coordinates entered in" value={mode} onChange={(e) => chooseMode(e.target.value as CoordinateMode)}>
          <option value="site">The site's system (EPSG:{site.epsgCode})</option>
          <option value="latlon">Latitude / longitude (WGS 84)</option>
          <option value="other">Another EPSG system</option>
        </SelectField>
        {mode === 'other' ? (
          <div className="space-y-1.5">
            <TextField
              label="EPSG code of the coordinates"
              inputMode="numeric"
              autoComplete="off"
              aria-describedby={crsStatusId}
              error={messageAt(errors, 'coordinates.epsg')}
              {...register('coordinates.epsg' as Path<WellFields>)}
            />
            {renderCrsStatus?.(crsStatusId, otherEpsg)}
          </div>
        ) : null}
        {mode === 'latlon' ? (
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField label="Latitude (°)" inputMode="decimal" autoComplete="off" hint="North positive, e.g. 47.7612" error={messageAt(errors, 'coordinates.lat')} {...register('coordinates.lat' as Path<WellFields>, { setValueAs: asNumber })} />
            <TextField label="Longitude (°)" inputMode="decimal" autoComplete="off" hint="East positive, e.g. 9.1551" error={messageAt(errors, 'coordinates.lon')} {...register('coordinates.lon' as Path<WellFields>, { setValueAs: asNumber })} />
          </div>
        ) : (
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField label="Easting (x)" inputMode="decimal" autoComplete="off" error={messageAt(errors, 'coordinates.x')} {...register('coordinates.x' as Path<WellFields>, { setValueAs: asNumber })} />
            <TextField label="Northing (y)" inputMode="decimal" autoComplete="off" error={messageAt(errors, 'coordinates.y')} {...register('coordinates.y' as Path<WellFields>, { setValueAs: asNumber })} />
          </div>
        )}
        <FieldError message={messageAt(errors, 'coordinates', 'coordinates.kind')} />
      </Group>

      <Group title="Elevations">
        <div className="grid gap-4 sm:grid-cols-2">
          <LengthInput name="groundElevation" label="Ground-surface elevation" register={register} errors={errors} />
          <LengthInput name="measuringPointElevation" label="Measuring point (top of casing) elevation" register={register} errors={errors} />
        </div>
      </Group>

      <Group title="Screen interval">
        <fieldset>
          <legend className="text-sm font-medium text-slate-800">Screen top and bottom given as</legend>
          <div className="mt-2 flex flex-wrap gap-x-6 gap-y-2">
            <label className="inline-flex items-center gap-2 text-sm text-slate-800">
              <input type="radio" value="depth" className="size-4 accent-accent-700" {...register('screenReference')} />
              Depths below ground
            </label>
            <label className="inline-flex items-center gap-2 text-sm text-slate-800">
              <input type="radio" value="elevation" className="size-4 accent-accent-700" {...register('screenReference')} />
              Elevations
            </label>
          </div>
        </fieldset>
        <div className="grid gap-4 sm:grid-cols-2">
          <LengthInput name="screenTop" label={`Screen top (${screenWord})`} register={register} errors={errors} />
          <LengthInput name="screenBottom" label={`Screen bottom (${screenWord})`} register={register} errors={errors} />
        </div>
      </Group>

      <Group title="Radii">
        <div className="grid gap-4 sm:grid-cols-3">
          <LengthInput name="casingRadius" label="Casing inner radius" hint="Where the water level moves; a 2-inch well: 1 in" register={register} errors={errors} />
          <LengthInput name="screenRadius" label="Screen radius" register={register} errors={errors} />
          <LengthInput name="boreholeRadius" label="Borehole radius" hint="Filter pack outer radius" register={register} errors={errors} />
        </div>
        <TextField
          label="Filter-pack porosity (optional)"
          inputMode="decimal"
          autoComplete="off"
          hint="Between 0 and 1, e.g. 0.30"
          className="sm:max-w-xs"
          error={errors.filterPackPorosity?.message}
          {...register('filterPackPorosity', { setValueAs: asNumber })}
        />
        <SelectField
          label="Intake radius (Hvorslev's R, Bouwer-Rice's rw)"
          className="sm:max-w-md"
          hint="With a filter pack (borehole wider than the screen) the borehole radius is common practice where the pack is more permeable than the formation; choose the screen radius only for a pack no more permeable than it. Every fit of this well takes this radius unless the analyst overrides it on the fit."
          error={errors.intakeRadius?.message}
          {...register('intakeRadius')}
        >
          <option value="borehole">Borehole radius (filter pack)</option>
          <option value="screen">Screen radius</option>
        </SelectField>
      </Group>

      <Group title="Aquifer and water level">
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField label="Hydrostratigraphic unit" error={errors.hydroUnit?.message} hint={site.hydroUnits.length === 0 ? 'The site has no units yet; a Lead adds them in the site details.' : undefined} {...register('hydroUnit')}>
            <option value="">Not assigned</option>
            {site.hydroUnits.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </SelectField>
          <SelectField label="Aquifer condition" error={errors.aquiferCondition?.message} {...register('aquiferCondition')}>
            {AQUIFER_CONDITIONS.map((c) => (
              <option key={c} value={c}>
                {c[0].toUpperCase() + c.slice(1)}
              </option>
            ))}
          </SelectField>
          <LengthInput name="staticWaterDepth" label="Static water depth below measuring point" optional register={register} errors={errors} />
          <LengthInput
            name="staticToScreenBottom"
            label="Static level to screen bottom (Lw)"
            optional
            hint="Left empty: worked out from the static water depth"
            register={register}
            errors={errors}
          />
          <LengthInput name="saturatedThickness" label="Saturated thickness" optional register={register} errors={errors} />
        </div>
      </Group>

      <TextAreaField label="Notes" error={errors.notes?.message} {...register('notes')} />

      <FormError message={errors.root?.server?.message} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" pending={isSubmitting}>
          {submitLabel}
        </Button>
        {onCancel ? (
          <Button variant="ghost" onClick={onCancel} disabled={isSubmitting}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
