import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Site } from '@shared/schemas/sites';
import { createSite, siteKeys } from '../api';
import { emptySiteForm } from '../form-schema';
import { SiteForm } from './site-form';

export function CreateSiteForm({ onCreated, onCancel }: { onCreated: (site: Site) => void; onCancel: () => void }) {
  const queryClient = useQueryClient();
  const mutation = useMutation({
    mutationFn: createSite,
    onSuccess: async (site) => {
      queryClient.setQueryData(siteKeys.detail(site.id), site);
      await queryClient.invalidateQueries({ queryKey: siteKeys.lists() });
    },
  });
  return (
    <SiteForm
      defaultValues={emptySiteForm}
      submitLabel="Create site"
      onCancel={onCancel}
      onSubmit={async (body) => onCreated(await mutation.mutateAsync(body))}
    />
  );
}
