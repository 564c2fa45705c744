import { useId, useState } from 'react';
import { cn } from '@/lib/cn';
import type { LayerVisibility } from './k-map';

const overlayButton =
  'inline-flex h-8 items-center gap-1.5 rounded-md bg-white px-2.5 text-sm font-medium text-slate-800 shadow ring-1 ring-slate-300 hover:bg-slate-50';

interface Props {
  onFitToSite: () => void;
  canFit: boolean;
  visibility: LayerVisibility;
  onVisibilityChange: (v: LayerVisibility) => void;
  hasLabels: boolean;
  basemaps: { id: string; name: string }[];
  basemapId: string;
  onBasemapChange: (id: string) => void;
}

const LAYER_CHOICES: { key: keyof LayerVisibility; label: string }[] = [
  { key: 'wells', label: 'Wells coloured by Well K' },
  { key: 'unanalysed', label: 'Wells without a Checked fit' },
  { key: 'labels', label: 'Well names (close zooms)' },
];

/** The map's own buttons: back to the whole site, and the layer list with the basemap switch. */
export function MapOverlay({ onFitToSite, canFit, visibility, onVisibilityChange, hasLabels, basemaps, basemapId, onBasemapChange }: Props) {
  const [open, setOpen] = useState(false);
  const panelId = useId();
  return (
    <div
      className="absolute top-2.5 left-2.5 z-10 flex max-w-[calc(100%-4rem)] flex-col items-start gap-2"
      onKeyDown={(e) => {
        if (e.key === 'Escape' && open) setOpen(false);
      }}
    >
      <div className="flex flex-wrap gap-2">
        <button type="button" className={overlayButton} onClick={onFitToSite} disabled={!canFit}>
          <svg aria-hidden="true" viewBox="0 0 16 16" className="size-4" fill="none" stroke="currentColor" strokeWidth="1.6">
            <path d="M2 6V2h4M10 2h4v4M14 10v4h-4M6 14H2v-4" />
          </svg>
          Fit to site
        </button>
        <button type="button" className={overlayButton} aria-expanded={open} aria-controls={panelId} onClick={() => setOpen((o) => !o)}>
          <svg aria-hidden="true" viewBox="0 0 16 16" className="size-4" fill="none" stroke="currentColor" strokeWidth="1.6">
            <path d="M8 2 14 5 8 8 2 5zM2 8l6 3 6-3M2 11l6 3 6-3" />
          </svg>
          Layers
        </button>
      </div>
      <div id={panelId} hidden={!open} className={cn('w-64 max-w-full rounded-md bg-white p-3 text-sm shadow-lg ring-1 ring-slate-300')}>
        <fieldset>
          <legend className="text-xs font-semibold tracking-wide text-slate-600 uppercase">Layers</legend>
          <div className="mt-1.5 space-y-1.5">
            {LAYER_CHOICES.map((c) => (
              <label key={c.key} className={cn('flex items-center gap-2 text-slate-800', c.key === 'labels' && !hasLabels && 'text-slate-400')}>
                <input
                  type="checkbox"
                  className="size-4 rounded border-slate-300 accent-accent-700"
                  checked={visibility[c.key]}
                  disabled={c.key === 'labels' && !hasLabels}
                  onChange={(e) => onVisibilityChange({ ...visibility, [c.key]: e.target.checked })}
                />
                {c.label}
              </label>
            ))}
          </div>
        </fieldset>
        <label className="mt-3 block">
          <span className="text-xs font-semibold tracking-wide text-slate-600 uppercase">Basemap</span>
          <select
            className="mt-1 block h-8 w-full rounded-md border-0 bg-white px-2 text-sm ring-1 ring-slate-300 ring-inset"
            value={basemapId}
            onChange={(e) => onBasemapChange(e.target.value)}
          >
            {basemaps.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </label>
      </div>
    </div>
  );
}
