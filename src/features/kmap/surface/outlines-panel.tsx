import { useState, type FormEvent } from 'react';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Outline } from '@shared/schemas/ksurface';
import type { DisplayUnits } from '@shared/schemas/sites';
import { Button } from '@/components/ui/button';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { describeError } from '@/lib/errors';
import { createOutline, deleteOutline, downloadUrl, outlineGeojsonUrl, patchOutline, surfaceKeys } from './api';
import { formatArea } from './model';
import type { useDraw } from './use-draw';

const input =
  'block h-8 w-full rounded-md border-0 bg-white px-2 text-sm text-slate-900 ring-1 ring-slate-300 ring-inset focus-visible:outline-2 focus-visible:outline-accent-600';
const label = 'block text-xs font-medium text-slate-700';
const fileName = (name: string) => `${name.replace(/[^\w-]+/g, '-')}.geojson`;

interface Props {
  siteId: string;
  siteCrsLabel: string;
  outlines: Outline[];
  canEdit: boolean;
  displayUnits: DisplayUnits;
  draw: ReturnType<typeof useDraw>;
  chosenId: string | null;
  onChoose: (id: string) => void;
}

/** The site's outlines: the list, upload, drawing and vertex editing, rename, delete, export. */
export function OutlinesPanel({ siteId, siteCrsLabel, outlines, canEdit, displayUnits, draw, chosenId, onChoose }: Props) {
  const queryClient = useQueryClient();
  const invalidate = () => queryClient.invalidateQueries({ queryKey: surfaceKeys.outlines(siteId) });
  const [uploadError, setUploadError] = useState<string | null>(null);
  const [drawError, setDrawError] = useState<string | null>(null);
  const [rowError, setRowError] = useState<{ id: string; message: string } | null>(null);
  const [renaming, setRenaming] = useState<{ id: string; name: string } | null>(null);
  const [drawnName, setDrawnName] = useState('');

  const upload = useMutation({
    mutationFn: async (form: { name: string; crs: 'wgs84' | 'site'; file: File }) => {
      let geometry: unknown;
      try {
        geometry = JSON.parse(await form.file.text());
      } catch {
        throw new Error(`${form.file.name} is not a GeoJSON file (it is not JSON).`);
      }
      return createOutline(siteId, { name: form.name, crs: form.crs, geometry });
    },
    onSuccess: (o) => {
      setUploadError(null);
      void invalidate();
      onChoose(o.id);
    },
    onError: (e) => setUploadError(describeError(e)),
  });
  const saveDrawn = useMutation({
    mutationFn: (body: { name: string; geometry: unknown }) => createOutline(siteId, { ...body, crs: 'wgs84' }),
    onSuccess: (o) => {
      setDrawError(null);
      setDrawnName('');
      draw.stop();
      void invalidate();
      onChoose(o.id);
    },
    onError: (e) => setDrawError(describeError(e)),
  });
  const patch = useMutation({
    mutationFn: ({ id, body }: { id: string; body: { name?: string; geometry?: unknown; crs?: 'wgs84' } }) => patchOutline(siteId, id, body),
    onSuccess: () => {
      setRowError(null);
      setRenaming(null);
      void invalidate();
    },
    onError: (e, v) => setRowError({ id: v.id, message: describeError(e) }),
  });
  const remove = useMutation({
    mutationFn: (id: string) => deleteOutline(siteId, id),
    onSuccess: () => void invalidate(),
    onError: (e, id) => setRowError({ id, message: describeError(e) }),
  });

  const onUpload = (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const data = new FormData(e.currentTarget);
    const file = data.get('file');
    const name = String(data.get('name') ?? '').trim();
    if (!(file instanceof File) || file.size === 0) return setUploadError('Choose a GeoJSON file.');
    if (!name) return setUploadError('Name is required.');
    upload.mutate({ name, crs: data.get('crs') === 'site' ? 'site' : 'wgs84', file });
  };

  const phase = draw.phase;
  const editing = phase.kind === 'editing' ? phase.outlineId : null;

  return (
    <div className="space-y-3 text-sm" data-testid="outlines-panel">
      {outlines.length === 0 ? <p className="text-xs text-slate-600">This site has no outline yet.</p> : null}
      <ul className="space-y-2" aria-label="Outlines">
        {outlines.map((o) => (
          <li key={o.id} className="rounded-md p-2 ring-1 ring-slate-200" data-outline={o.name}>
            {renaming?.id === o.id ? (
              <form
                className="flex gap-1.5"
                onSubmit={(e) => {
                  e.preventDefault();
                  patch.mutate({ id: o.id, body: { name: renaming.name } });
                }}
              >
                <input aria-label="New name" className={input} value={renaming.name} onChange={(e) => setRenaming({ id: o.id, name: e.target.value })} />
                <Button size="sm" type="submit" pending={patch.isPending}>
                  Save
                </Button>
                <Button size="sm" variant="ghost" onClick={() => setRenaming(null)}>
                  Cancel
                </Button>
              </form>
            ) : (
              <div className="flex items-baseline justify-between gap-2">
                <button type="button" className="min-w-0 truncate text-left font-medium text-slate-900 hover:underline" onClick={() => onChoose(o.id)} aria-pressed={chosenId === o.id}>
                  {o.name}
                </button>
                <span className="shrink-0 text-xs text-slate-500">{formatArea(o.areaM2, displayUnits)}</span>
              </div>
            )}
            <div className="mt-1.5 flex flex-wrap gap-1.5">
              <Button size="sm" variant="ghost" onClick={() => void downloadUrl(outlineGeojsonUrl(siteId, o.id), fileName(o.name)).catch((e) => setRowError({ id: o.id, message: describeError(e) }))}>
                Export
              </Button>
              {canEdit ? (
                <>
                  <Button size="sm" variant="ghost" onClick={() => setRenaming({ id: o.id, name: o.name })} aria-label={`Rename ${o.name}`}>
                    Rename
                  </Button>
                  {editing === o.id ? (
                    <>
                      <Button
                        size="sm"
                        pending={patch.isPending}
                        onClick={() => {
                          const geometry = draw.editedGeometry();
                          if (geometry) patch.mutate({ id: o.id, body: { geometry, crs: 'wgs84' } }, { onSuccess: () => draw.stop() });
                        }}
                      >
                        Save shape
                      </Button>
                      <Button size="sm" variant="ghost" onClick={draw.stop}>
                        Cancel
                      </Button>
                    </>
                  ) : (
                    <Button
                      size="sm"
                      variant="ghost"
                      disabled={phase.kind !== 'off'}
                      aria-label={`Edit the shape of ${o.name}`}
                      onClick={() => {
                        if (o.geometry.type !== 'Polygon') return setRowError({ id: o.id, message: 'An outline of several polygons cannot be edited on the map; upload it again instead.' });
                        const reason = draw.startEditing(o.id, o.geometry);
                        setRowError(reason ? { id: o.id, message: reason } : null);
                      }}
                    >
                      Edit shape
                    </Button>
                  )}
                  <ConfirmButton question={`Delete ${o.name}?`} confirmLabel="Delete" onConfirm={() => remove.mutate(o.id)} pending={remove.isPending} aria-label={`Delete ${o.name}`}>
                    Delete
                  </ConfirmButton>
                </>
              ) : null}
            </div>
            {editing === o.id ? <p className="mt-1 text-xs text-slate-600">Drag a vertex to move it, the midpoint of an edge to add one; right-click a vertex to remove it.</p> : null}
            {rowError?.id === o.id ? (
              <p role="alert" className="mt-1 text-xs text-red-700">
                {rowError.message}
              </p>
            ) : null}
          </li>
        ))}
      </ul>

      {canEdit ? (
        <>
          <div className="space-y-2 rounded-md bg-slate-50 p-2 ring-1 ring-slate-200">
            <h3 className="text-xs font-semibold text-slate-700">Draw a new outline</h3>
            {phase.kind === 'drawing' ? (
              <div className="flex items-center justify-between gap-2">
                <p className="text-xs text-slate-700">Click the corners on the map; click the first corner again to close it.</p>
                <Button size="sm" variant="ghost" onClick={draw.stop}>
                  Cancel
                </Button>
              </div>
            ) : phase.kind === 'drawn' ? (
              <form
                className="space-y-1.5"
                onSubmit={(e) => {
                  e.preventDefault();
                  if (!drawnName.trim()) return setDrawError('Name is required.');
                  saveDrawn.mutate({ name: drawnName.trim(), geometry: phase.geometry });
                }}
              >
                <label className={label} htmlFor="drawn-name">
                  Name of the drawn outline
                </label>
                <input id="drawn-name" className={input} value={drawnName} onChange={(e) => setDrawnName(e.target.value)} />
                <div className="flex gap-1.5">
                  <Button size="sm" type="submit" pending={saveDrawn.isPending}>
                    Save outline
                  </Button>
                  <Button size="sm" variant="ghost" onClick={draw.stop}>
                    Discard
                  </Button>
                </div>
              </form>
            ) : (
              <Button size="sm" variant="secondary" disabled={phase.kind !== 'off'} onClick={() => draw.startDrawing()}>
                Draw on the map
              </Button>
            )}
            {drawError ? (
              <p role="alert" className="text-xs text-red-700">
                {drawError}
              </p>
            ) : null}
          </div>

          <form className="space-y-2 rounded-md bg-slate-50 p-2 ring-1 ring-slate-200" onSubmit={onUpload} aria-label="Upload an outline">
            <h3 className="text-xs font-semibold text-slate-700">Upload a GeoJSON outline</h3>
            <div>
              <label className={label} htmlFor="outline-name">
                Name
              </label>
              <input id="outline-name" name="name" className={input} placeholder="e.g. Plume 2026" />
            </div>
            <div>
              <label className={label} htmlFor="outline-file">
                GeoJSON file (a Polygon or MultiPolygon)
              </label>
              <input id="outline-file" name="file" type="file" accept=".geojson,.json,application/geo+json,application/json" className="block w-full text-xs" />
            </div>
            <div>
              <label className={label} htmlFor="outline-crs">
                Coordinates in
              </label>
              <select id="outline-crs" name="crs" className={input} defaultValue="wgs84">
                <option value="wgs84">WGS 84 (longitude, latitude)</option>
                <option value="site">The site’s system ({siteCrsLabel})</option>
              </select>
            </div>
            <Button size="sm" type="submit" pending={upload.isPending}>
              Upload outline
            </Button>
            {uploadError ? (
              <p role="alert" className="text-xs text-red-700" data-testid="outline-upload-error">
                {uploadError}
              </p>
            ) : null}
          </form>
        </>
      ) : null}
    </div>
  );
}
