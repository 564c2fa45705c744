import { useId, useMemo, useState } from 'react';
import type { MapWellFeature } from '../model';

const MAX_MATCHES = 8;

/** Find a well by name and select it: the way to the wells without a pointer. */
export function WellFinder({ wells, onPick }: { wells: readonly MapWellFeature[]; onPick: (id: string) => void }) {
  const id = useId();
  const [text, setText] = useState('');
  const matches = useMemo(() => {
    const q = text.trim().toLowerCase();
    if (!q) return [];
    const starts: MapWellFeature[] = [];
    const contains: MapWellFeature[] = [];
    for (const w of wells) {
      const name = w.properties.name.toLowerCase();
      if (name.startsWith(q)) starts.push(w);
      else if (name.includes(q)) contains.push(w);
      if (starts.length >= MAX_MATCHES) break;
    }
    return [...starts, ...contains].slice(0, MAX_MATCHES);
  }, [text, wells]);

  const pick = (w: MapWellFeature) => {
    onPick(w.id);
    setText('');
  };

  return (
    <div className="relative">
      <label htmlFor={id} className="block text-sm font-medium text-slate-800">
        Find a well
      </label>
      <input
        id={id}
        type="search"
        autoComplete="off"
        className="mt-1 block h-8 w-full rounded-md border-0 px-2 text-sm ring-1 ring-slate-300 ring-inset"
        value={text}
        onChange={(e) => setText(e.target.value)}
        onKeyDown={(e) => {
          if (e.key === 'Enter' && matches[0]) {
            e.preventDefault();
            pick(matches[0]);
          }
        }}
        aria-describedby={`${id}-hint`}
      />
      <p id={`${id}-hint`} className="mt-1 text-xs text-slate-500">
        Type part of a name; Enter picks the first match.
      </p>
      {matches.length > 0 ? (
        <ul aria-label="Matching wells" className="absolute z-20 mt-1 max-h-64 w-full overflow-auto rounded-md bg-white py-1 text-sm shadow-lg ring-1 ring-slate-300">
          {matches.map((w) => (
            <li key={w.id}>
              <button type="button" className="block w-full px-3 py-1.5 text-left hover:bg-slate-100 focus:bg-slate-100 focus:outline-none" onClick={() => pick(w)}>
                {w.properties.name}
                <span className="ml-2 text-xs text-slate-500">{w.properties.hydroUnit ?? ''}</span>
              </button>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
