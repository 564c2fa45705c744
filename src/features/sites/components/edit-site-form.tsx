import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Site } from '@shared/schemas/sites';
import { SelectField } from '@/components/ui/field';
import { basemapChoicesQueryOptions } from '@/features/basemaps/api';
import { siteKeys, updateSite } from '../api';
import { siteToForm, type SiteFormOutput } from '../form-schema';
import { SiteForm } from './site-form';

export function EditSiteForm({ site, onSaved, onCancel }: { site: Site; onSaved: (site: Site) => void; onCancel: () => void }) {
  const queryClient = useQueryClient();
  // "" is the instance default; the basemaps themselves come from the instance's list.
  const [basemapId, setBasemapId] = useState(site.basemapId ?? '');
  const basemaps = useQuery(basemapChoicesQueryOptions());
  const instanceDefault = basemaps.data?.find((b) => b.isDefault);
  const mutation = useMutation({
    mutationFn: (body: SiteFormOutput) => updateSite(site.id, { ...body, basemapId: basemapId || null }),
    onSuccess: async (saved) => {
      queryClient.setQueryData(siteKeys.detail(saved.id), saved);
      await queryClient.invalidateQueries({ queryKey: siteKeys.lists() });
    },
  });
  return (
    <SiteForm
      defaultValues={siteToForm(site)}
      submitLabel="Save changes"
      onCancel={onCancel}
      onSubmit={async (body) => onSaved(await mutation.mutateAsync(body))}
    >
      <SelectField
        label="Basemap"
        hint="The map drawn under this site's wells. An Admin adds basemaps under Admin → Basemaps."
        value={basemapId}
        onChange={(e) => setBasemapId(e.target.value)}
        className="max-w-md"
      >
        <option value="">Instance default{instanceDefault ? ` (${instanceDefault.name})` : ''}</option>
        {basemaps.data?.map((b) => (
          <option key={b.id} value={b.id}>
            {b.name}
          </option>
        ))}
        {site.basemapId && basemaps.data && !basemaps.data.some((b) => b.id === site.basemapId) ? (
          <option value={site.basemapId}>The basemap chosen before (no longer available)</option>
        ) : null}
      </SelectField>
    </SiteForm>
  );
}
