import { useRef, useState } from 'react';
import type { ViewerLinkCreated } from '@shared/schemas/viewer-links';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { formatDate } from '@/lib/format';
import { EmailLinkForm } from './email-link-form';
import { layerWords } from './link-status';

type CopyState = 'idle' | 'copied' | 'refused';

/**
 * The one time a link's URL is on screen: Kfield keeps only the token's hash. The URL lives in
 * this component's props (the page's state) and goes nowhere else.
 */
export function CreatedLinkPanel({ link, showOutboxHint, onDone }: { link: ViewerLinkCreated; showOutboxHint: boolean; onDone: () => void }) {
  const input = useRef<HTMLInputElement>(null);
  const [copy, setCopy] = useState<CopyState>('idle');

  const copyUrl = async () => {
    try {
      if (!navigator.clipboard) throw new Error('No clipboard');
      await navigator.clipboard.writeText(link.url);
      setCopy('copied');
    } catch {
      input.current?.focus();
      input.current?.select();
      setCopy('refused');
    }
  };

  return (
    <div className="space-y-5">
      <Alert tone="success" title={`Viewer link made for “${link.label}”`}>
        Copy the URL now: Kfield cannot show it again, because it keeps only a fingerprint of it. If the URL is lost, revoke the
        link and make a new one.
      </Alert>
      <div className="space-y-1.5">
        <div className="flex flex-col gap-2 sm:flex-row">
          <input
            ref={input}
            aria-label="Viewer link URL"
            readOnly
            autoFocus
            spellCheck={false}
            value={link.url}
            onFocus={(event) => event.currentTarget.select()}
            className="block w-full min-w-0 rounded-md border-0 bg-slate-50 px-3 py-2 font-mono text-sm text-slate-900 shadow-sm ring-1 ring-slate-300 ring-inset focus-visible:outline-2 focus-visible:outline-accent-600"
          />
          <Button onClick={() => void copyUrl()} className="shrink-0">
            Copy
          </Button>
        </div>
        <p role="status" className="min-h-5 text-sm text-slate-600">
          {copy === 'copied' ? 'Copied to the clipboard.' : null}
          {copy === 'refused' ? 'The browser did not let Kfield copy. The URL is selected: copy it yourself (Ctrl+C, ⌘C, or press and hold on a phone).' : null}
        </p>
        <p className="text-sm text-slate-600">
          Layers: {layerWords(link.layers).join(', ')} · works until {formatDate(link.expiresAt)}
        </p>
      </div>
      <section aria-labelledby="email-link-title" className="space-y-3 border-t border-slate-200 pt-4">
        <h3 id="email-link-title" className="text-sm font-semibold text-slate-900">
          E-mail this link
        </h3>
        <EmailLinkForm linkId={link.id} url={link.url} showOutboxHint={showOutboxHint} />
      </section>
      <div className="border-t border-slate-200 pt-4">
        <Button variant="ghost" onClick={onDone}>
          Make another link
        </Button>
      </div>
    </div>
  );
}
