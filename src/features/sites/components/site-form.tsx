import { useId, type ReactNode } from 'react';
import { useFieldArray, useForm, type Path } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { DISPLAY_UNITS, DISPLAY_UNITS_LABELS } from '@shared/schemas/sites';
import { Button } from '@/components/ui/button';
import { FieldError, TextAreaField, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { applyServerErrors } from '@/lib/form-errors';
import { siteFormSchema, type SiteFormOutput, type SiteFormValues } from '../form-schema';
import { CrsLookup } from './crs-lookup';

const DIRECT_FIELDS = new Set(['name', 'description', 'epsgCode', 'displayUnits', 'hydroUnits']);

/** Server field names ("hydroUnits.2") onto this form's paths ("hydroUnits.2.name"). */
function mapSiteField(serverField: string): Path<SiteFormValues> | null {
  if (DIRECT_FIELDS.has(serverField)) return serverField as Path<SiteFormValues>;
  const unit = /^hydroUnits\.(\d+)(?:\.name)?$/.exec(serverField);
  if (unit) return `hydroUnits.${Number(unit[1])}.name`;
  return null;
}

type Props = {
  defaultValues: SiteFormValues;
  submitLabel: string;
  onSubmit: (body: SiteFormOutput) => Promise<unknown>;
  onCancel?: () => void;
  /** Further fields that the form around this one owns (e.g. the basemap when editing). */
  children?: ReactNode;
};

export function SiteForm({ defaultValues, submitLabel, onSubmit, onCancel, children }: Props) {
  const crsStatusId = useId();
  const {
    register,
    control,
    handleSubmit,
    setError,
    watch,
    formState: { errors, isSubmitting },
  } = useForm<SiteFormValues, unknown, SiteFormOutput>({
    resolver: zodResolver(siteFormSchema),
    defaultValues,
  });
  const units = useFieldArray({ control, name: 'hydroUnits' });
  const epsgValue = watch('epsgCode');

  const submit = handleSubmit(async (body) => {
    try {
      await onSubmit(body);
    } catch (error) {
      applyServerErrors(error, setError, mapSiteField);
    }
  });

  const unitsError = errors.hydroUnits?.message ?? errors.hydroUnits?.root?.message;

  return (
    <form onSubmit={submit} noValidate className="space-y-5">
      <TextField label="Site name" autoComplete="off" error={errors.name?.message} {...register('name')} />
      <TextAreaField
        label="Description"
        hint="Optional: the facility, the aquifer, what the network is for."
        error={errors.description?.message}
        {...register('description')}
      />
      <div className="space-y-1.5">
        <TextField
          label="EPSG code"
          inputMode="numeric"
          autoComplete="off"
          hint="The site's coordinate reference system, e.g. 32632 for WGS 84 / UTM zone 32N."
          aria-describedby={crsStatusId}
          error={errors.epsgCode?.message}
          {...register('epsgCode')}
        />
        <CrsLookup id={crsStatusId} value={epsgValue} />
      </div>

      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-slate-800">Display units</legend>
        <div className="flex flex-wrap gap-x-6 gap-y-2">
          {DISPLAY_UNITS.map((value) => (
            <label key={value} className="inline-flex items-center gap-2 text-sm text-slate-800">
              <input type="radio" value={value} className="size-4 accent-accent-700" {...register('displayUnits')} />
              {DISPLAY_UNITS_LABELS[value]}
            </label>
          ))}
        </div>
        <FieldError message={errors.displayUnits?.message} />
      </fieldset>

      <fieldset className="space-y-3">
        <legend className="text-sm font-medium text-slate-800">Hydrostratigraphic units</legend>
        <p className="text-xs text-slate-500">
          The layers wells can be screened in, e.g. “Upper sand and gravel”, “Silt aquitard”. You can add more later.
        </p>
        {units.fields.length > 0 ? (
          <ol className="space-y-2">
            {units.fields.map((field, index) => (
              <li key={field.id} className="flex items-start gap-2">
                <TextField
                  className="min-w-0 flex-1"
                  label={<span className="sr-only">Hydrostratigraphic unit {index + 1}</span>}
                  autoComplete="off"
                  error={errors.hydroUnits?.[index]?.name?.message}
                  {...register(`hydroUnits.${index}.name`)}
                />
                <Button
                  variant="ghost"
                  size="md"
                  className="mt-1.5 px-3"
                  aria-label={`Remove unit ${index + 1}`}
                  onClick={() => units.remove(index)}
                >
                  Remove
                </Button>
              </li>
            ))}
          </ol>
        ) : null}
        <FieldError message={unitsError} />
        <Button
          variant="secondary"
          size="sm"
          onClick={() => units.append({ name: '' }, { shouldFocus: true })}
          disabled={units.fields.length >= 50}
        >
          Add unit
        </Button>
      </fieldset>

      {children}
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
