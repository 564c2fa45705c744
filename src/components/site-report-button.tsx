import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { CAUTIONS } from '@shared/cautions';

/** The site report's file name from the answer's Content-Disposition (the server names it: site, content, date). */
function fileNameOf(disposition: string | null): string {
  return /filename="([^"]+)"/.exec(disposition ?? '')?.[1] ?? 'site-report.pdf';
}

/**
 * Fetches the site report (a plain GET; the session cookie goes along) with a spinner while the
 * server prepares it, then saves the PDF. The cautions are shown beside it, as in the report.
 */
export function SiteReportButton({ siteId, size = 'md' }: { siteId: string; size?: 'sm' | 'md' }) {
  const [state, setState] = useState<'idle' | 'running' | { error: string }>('idle');
  const run = async () => {
    setState('running');
    try {
      const res = await fetch(`/api/sites/${siteId}/reports/site.pdf`, { credentials: 'same-origin' });
      if (!res.ok) throw new Error(`The server answered ${res.status}`);
      const blob = await res.blob();
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = fileNameOf(res.headers.get('Content-Disposition'));
      document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
      setState('idle');
    } catch (e) {
      setState({ error: (e as Error).message });
    }
  };
  return (
    <span className="inline-flex items-center gap-2" data-testid="site-report">
      <Button variant="secondary" size={size} pending={state === 'running'} onClick={() => void run()} title={`${CAUTIONS[0]} ${CAUTIONS[1]}`}>
        Site report (PDF)
      </Button>
      {state === 'running' ? <Spinner label="Preparing the site report…" /> : null}
      {typeof state === 'object' ? <span role="alert" className="text-xs text-red-700">The site report could not be made: {state.error}</span> : null}
    </span>
  );
}
