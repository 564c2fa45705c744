import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import type { Basemap } from '@shared/schemas/basemaps';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { Table, Td, Th } from '@/components/ui/table';
import { useToast } from '@/components/ui/toast';
import { describeError } from '@/lib/errors';
import { plural } from '@/lib/format';
import { adminBasemapsQueryOptions, basemapKeys, deleteBasemap, updateBasemap } from '../api';
import { formatBounds, formatBytes } from '../format';

export function BasemapsTable({ previewId, onPreview }: { previewId: string | null; onPreview: (id: string) => void }) {
  const { data: basemaps } = useSuspenseQuery(adminBasemapsQueryOptions());
  return (
    <Table caption="Basemaps" minWidth="min-w-[56rem]" stackOnMobile>
      <thead>
        <tr>
          <Th>Name</Th>
          <Th>Bounds</Th>
          <Th>Zooms</Th>
          <Th>Size</Th>
          <Th>Sites</Th>
          <Th className="text-right">Actions</Th>
        </tr>
      </thead>
      <tbody>
        {basemaps.map((b) => (
          <BasemapRow key={b.id} basemap={b} previewing={b.id === previewId} onPreview={() => onPreview(b.id)} />
        ))}
      </tbody>
    </Table>
  );
}

function BasemapRow({ basemap, previewing, onPreview }: { basemap: Basemap; previewing: boolean; onPreview: () => void }) {
  const queryClient = useQueryClient();
  const toast = useToast();
  const invalidate = () => queryClient.invalidateQueries({ queryKey: basemapKeys.all });
  const makeDefault = useMutation({
    mutationFn: () => updateBasemap(basemap.id, { isDefault: true }),
    onSuccess: () => toast.success(`${basemap.name} is now the instance default.`),
    onError: (error) => toast.error(describeError(error)),
    onSettled: invalidate,
  });
  const remove = useMutation({
    mutationFn: () => deleteBasemap(basemap.id),
    onSuccess: () => toast.success(`${basemap.name} was deleted.`),
    onError: (error) => toast.error(describeError(error)),
    onSettled: invalidate,
  });
  const { metadata: m } = basemap;
  return (
    <tr className={previewing ? 'bg-accent-50/40' : undefined}>
      <Td label="Name">
        <div className="flex flex-wrap items-center gap-2">
          <span className="font-medium text-slate-900">{basemap.name}</span>
          {basemap.builtIn ? <Badge>Built-in</Badge> : null}
          {basemap.isDefault ? <Badge tone="accent">Instance default</Badge> : null}
        </div>
        {m.attribution ? <p className="mt-0.5 text-xs text-slate-500">{m.attribution}</p> : null}
      </Td>
      <Td label="Bounds" className="text-slate-700">{formatBounds(m.bounds)}</Td>
      <Td label="Zooms" className="whitespace-nowrap tabular-nums">
        {m.minzoom}–{m.maxzoom}
      </Td>
      <Td label="Size" className="whitespace-nowrap tabular-nums">{formatBytes(basemap.sizeBytes)}</Td>
      <Td label="Sites" className="whitespace-nowrap">{plural(basemap.siteCount, 'site', 'sites')}</Td>
      <Td label="Actions" className="text-right">
        <div className="flex flex-wrap justify-end gap-2">
          <Button variant={previewing ? 'secondary' : 'ghost'} size="sm" onClick={onPreview} aria-pressed={previewing} aria-label={`Preview ${basemap.name}`}>
            Preview
          </Button>
          {!basemap.isDefault ? (
            <Button variant="secondary" size="sm" pending={makeDefault.isPending} onClick={() => makeDefault.mutate()} aria-label={`Make ${basemap.name} the instance default`}>
              Make default
            </Button>
          ) : null}
          {!basemap.builtIn ? (
            <ConfirmButton
              confirmLabel="Delete"
              question={basemap.siteCount > 0 ? `Delete it? ${plural(basemap.siteCount, 'site goes', 'sites go')} back to the default.` : 'Delete this basemap?'}
              pending={remove.isPending}
              onConfirm={() => remove.mutate()}
              aria-label={`Delete ${basemap.name}`}
            >
              Delete
            </ConfirmButton>
          ) : null}
        </div>
      </Td>
    </tr>
  );
}
