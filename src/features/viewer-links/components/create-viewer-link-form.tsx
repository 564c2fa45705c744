import { useForm, type Path } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import {
  VIEWER_LINK_DEFAULT_DAYS,
  VIEWER_LINK_MAX_DAYS,
  viewerLinkBodySchema,
  viewerSurfaceSettingsSchema,
  type ViewerLinkCreated,
} from '@shared/schemas/viewer-links';
import { Button } from '@/components/ui/button';
import { CheckboxField, FieldError, SelectField, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { applyServerErrors } from '@/lib/form-errors';
import { formatDate } from '@/lib/format';
import { createViewerLink, linkOutlinesQueryOptions, viewerLinkKeys } from '../api';
import { expiryDate } from './link-status';

type Values = z.input<typeof viewerLinkBodySchema>;
type Body = z.output<typeof viewerLinkBodySchema>;

/** The K surface settings a link freezes start where the K map starts (power 2, every well, no radius). */
const SURFACE_DEFAULTS = viewerSurfaceSettingsSchema.parse({});

const FIELDS = new Set([
  'label', 'expiresInDays', 'layers', 'showNames', 'showConstruction',
  'layers.surfaceSettings.outlineId', 'layers.surfaceSettings.power', 'layers.surfaceSettings.neighbours', 'layers.surfaceSettings.searchRadiusM',
]);

/** Server fields are this form's paths; any other layer field ("layers.wells") goes under the layers. */
function mapLinkField(serverField: string): Path<Values> | null {
  if (FIELDS.has(serverField)) return serverField as Path<Values>;
  return serverField.startsWith('layers.') ? 'layers' : null;
}

/** "Choose at least one layer" belongs to the group: a tick re-checks the group, not only its own box. */
const layerOptions = { deps: 'layers' } as const;

/** Empty is "not set": every well, no search radius, no outline. */
const emptyAsUnset = (v: unknown) => (v === '' || v === null ? undefined : v);

export function CreateViewerLinkForm({ siteId, onCreated }: { siteId: string; onCreated: (link: ViewerLinkCreated) => void }) {
  const queryClient = useQueryClient();
  const {
    register,
    handleSubmit,
    setError,
    watch,
    formState: { errors },
  } = useForm<Values, unknown, Body>({
    resolver: zodResolver(viewerLinkBodySchema),
    defaultValues: {
      label: '',
      expiresInDays: VIEWER_LINK_DEFAULT_DAYS,
      layers: { wells: true, surface: false, outlines: false, sketches: false, surfaceSettings: { power: SURFACE_DEFAULTS.power } },
      showNames: false,
      showConstruction: false,
    },
  });
  const surfaceOn = watch('layers.surface') === true;
  const outlines = useQuery({ ...linkOutlinesQueryOptions(siteId), enabled: surfaceOn });

  const mutation = useMutation({
    mutationFn: async (body: Body) => {
      const { url, ...link } = await createViewerLink(siteId, body);
      void queryClient.invalidateQueries({ queryKey: viewerLinkKeys.list(siteId) });
      // The URL goes to the caller's state and nowhere else: the mutation keeps the link without it.
      onCreated({ ...link, url });
      return link;
    },
  });

  const onSubmit = handleSubmit((values) => mutation.mutateAsync(values).catch((error: unknown) => applyServerErrors(error, setError, mapLinkField)));

  const days = viewerLinkBodySchema.shape.expiresInDays.safeParse(watch('expiresInDays'));
  const layersError = errors.layers?.message ?? errors.layers?.root?.message;
  const surfaceErrors = errors.layers?.surfaceSettings;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <div className="grid gap-4 sm:grid-cols-[1fr_12rem]">
        <TextField
          label="Label"
          autoComplete="off"
          hint="Who the link is for, e.g. “County water board”. Only the site’s Leads see it."
          error={errors.label?.message}
          {...register('label')}
        />
        <TextField
          label="Expiry (days)"
          type="number"
          inputMode="numeric"
          min={1}
          max={VIEWER_LINK_MAX_DAYS}
          step={1}
          hint={days.success ? `Works until ${formatDate(expiryDate(days.data).toISOString())}` : `1 to ${VIEWER_LINK_MAX_DAYS} days`}
          error={errors.expiresInDays?.message}
          {...register('expiresInDays')}
        />
      </div>

      <fieldset className="space-y-3" aria-describedby={layersError ? 'viewer-link-layers-error' : undefined}>
        <legend className="text-sm font-medium text-slate-800">Layers</legend>
        <div className="grid gap-3 sm:grid-cols-2">
          <CheckboxField label="Wells by Well K" {...register('layers.wells', layerOptions)} />
          <CheckboxField label="K surface" hint="Frozen with the settings you choose here: viewers cannot change them." {...register('layers.surface', layerOptions)} />
          <CheckboxField label="Outlines" {...register('layers.outlines', layerOptions)} />
          <CheckboxField label="Capture sketches" {...register('layers.sketches', layerOptions)} />
        </div>
        <FieldError id="viewer-link-layers-error" message={layersError} />
      </fieldset>

      {surfaceOn ? (
        <fieldset className="space-y-4 rounded-lg border border-slate-200 p-4">
          <legend className="px-1 text-sm font-semibold text-slate-900">K surface settings</legend>
          <SelectField
            label="Clip to outline"
            disabled={outlines.isPending}
            hint={outlines.isError ? 'The outlines could not be loaded; the surface covers the wells’ extent.' : undefined}
            error={surfaceErrors?.outlineId?.message}
            {...register('layers.surfaceSettings.outlineId', { setValueAs: emptyAsUnset, shouldUnregister: true })}
          >
            <option value="">{outlines.isPending ? 'Loading outlines…' : 'None (the wells’ extent)'}</option>
            {(outlines.data ?? []).map((o) => (
              <option key={o.id} value={o.id}>
                {o.name}
              </option>
            ))}
          </SelectField>
          <div className="grid gap-4 sm:grid-cols-3">
            <TextField
              label="IDW power"
              type="number"
              inputMode="decimal"
              min={0.5}
              max={6}
              step={0.5}
              hint={`0.5 to 6; the K map starts at ${SURFACE_DEFAULTS.power}`}
              error={surfaceErrors?.power?.message}
              {...register('layers.surfaceSettings.power', { shouldUnregister: true })}
            />
            <TextField
              label="Neighbours"
              type="number"
              inputMode="numeric"
              min={1}
              step={1}
              placeholder="all"
              hint="Nearest wells used; empty: every well"
              error={surfaceErrors?.neighbours?.message}
              {...register('layers.surfaceSettings.neighbours', { setValueAs: emptyAsUnset, shouldUnregister: true })}
            />
            <TextField
              label="Search radius (m)"
              inputMode="decimal"
              placeholder="none"
              hint="Empty: no limit"
              error={surfaceErrors?.searchRadiusM?.message}
              {...register('layers.surfaceSettings.searchRadiusM', { setValueAs: emptyAsUnset, shouldUnregister: true })}
            />
          </div>
        </fieldset>
      ) : null}

      <fieldset className="space-y-3">
        <legend className="text-sm font-medium text-slate-800">Well details</legend>
        <CheckboxField
          label="Show well names"
          hint="Viewers then see each well’s name on the map and in its details; off, wells are unnamed points."
          error={errors.showNames?.message}
          {...register('showNames')}
        />
        <CheckboxField
          label="Show well construction"
          hint="Viewers then see ground elevation and the screen’s top and bottom (depths and elevations)."
          error={errors.showConstruction?.message}
          {...register('showConstruction')}
        />
      </fieldset>

      <FormError message={errors.root?.server?.message} />
      <Button type="submit" pending={mutation.isPending}>
        Make viewer link
      </Button>
    </form>
  );
}
