import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Site } from '@shared/schemas/sites';
import { siteKeys, updateSite } from '../api';
import { siteToForm, type SiteFormOutput } from '../form-schema';
import { SiteForm } from './site-form';

export function EditSiteForm({ site, onSaved, onCancel }: { site: Site; onSaved: (site: Site) => void; onCancel: () => void }) {
  const queryClient = useQueryClient();
  const mutation = useMutation({
    mutationFn: (body: SiteFormOutput) => updateSite(site.id, body),
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
    />
  );
}
