import type { ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import { epsgCodeSchema } from '@shared/schemas/sites';
import { Spinner } from '@/components/ui/spinner';
import { useDebouncedValue } from '@/lib/use-debounced-value';
import { crsQueryOptions } from '../api';

/** The name of the CRS for the code being typed, looked up once the typing pauses. */
export function CrsLookup({ value, id }: { value: unknown; id: string }) {
  const debounced = useDebouncedValue(String(value ?? '').trim(), 350);
  const parsed = debounced === '' ? null : epsgCodeSchema.safeParse(debounced);
  const code = parsed?.success ? parsed.data : null;
  const query = useQuery({ ...crsQueryOptions(code ?? 0), enabled: code !== null });

  let content: ReactNode = null;
  if (code === null) {
    content = null;
  } else if (query.isPending) {
    content = <Spinner label={`Looking up EPSG:${code}…`} />;
  } else if (query.isError) {
    content = <span className="text-slate-600">The CRS name could not be looked up just now.</span>;
  } else if (query.data === null) {
    content = <span className="text-amber-800">No coordinate reference system is known by EPSG:{code}.</span>;
  } else if (query.data) {
    const crs = query.data;
    content = (
      <span className="text-slate-700">
        <span className="font-medium text-slate-900">{crs.name}</span>
        {crs.unit ? <span className="text-slate-500"> · units: {crs.unit}</span> : null}
        {crs.area ? (
          <span className="line-clamp-2 block text-xs text-slate-500" title={crs.area}>
            Area of use: {crs.area}
          </span>
        ) : null}
      </span>
    );
  }

  return (
    <div id={id} aria-live="polite" className="min-h-5 text-sm">
      {content}
    </div>
  );
}
