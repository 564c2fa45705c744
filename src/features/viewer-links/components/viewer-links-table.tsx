import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import type { ViewerLink } from '@shared/schemas/viewer-links';
import { Badge } from '@/components/ui/badge';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { EmptyState } from '@/components/ui/empty-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useToast } from '@/components/ui/toast';
import { cn } from '@/lib/cn';
import { describeError } from '@/lib/errors';
import { formatDate, formatDateTime } from '@/lib/format';
import { revokeViewerLink, viewerLinkKeys, viewerLinksQueryOptions } from '../api';
import { layerWords, viewerLinkStatus, wellDetailWords, type ViewerLinkStatus } from './link-status';

const STATUS_TONES = { Active: 'accent', Revoked: 'neutral', Expired: 'warning' } as const satisfies Record<ViewerLinkStatus, string>;

/** Every link the site has had, newest first; revoked and expired ones stay listed, greyed. */
export function ViewerLinksTable({ siteId, onRevoked }: { siteId: string; onRevoked?: (linkId: string) => void }) {
  const { data: links } = useSuspenseQuery(viewerLinksQueryOptions(siteId));
  const now = Date.now();
  return (
    <div data-testid="viewer-links-list">
      {links.length === 0 ? (
        <div className="p-4 sm:p-5">
          <EmptyState title="No viewer links yet">
            A viewer link lets someone without a Kfield account open this site’s K map, read-only, until it expires or you revoke it.
          </EmptyState>
        </div>
      ) : (
        <Table caption="Viewer links" minWidth="min-w-[60rem]" stackOnMobile>
          <thead>
            <tr>
              <Th>Label</Th>
              <Th>Layers</Th>
              <Th className="whitespace-nowrap">Well details</Th>
              <Th>Created</Th>
              <Th>Expires</Th>
              <Th className="whitespace-nowrap">Last viewed</Th>
              <Th className="text-right">Views</Th>
              <Th>Status</Th>
              <Th className="text-right">Actions</Th>
            </tr>
          </thead>
          <tbody>
            {links.map((link) => (
              <ViewerLinkRow key={link.id} siteId={siteId} link={link} status={viewerLinkStatus(link, now)} onRevoked={onRevoked} />
            ))}
          </tbody>
        </Table>
      )}
    </div>
  );
}

function ViewerLinkRow({
  siteId,
  link,
  status,
  onRevoked,
}: {
  siteId: string;
  link: ViewerLink;
  status: ViewerLinkStatus;
  onRevoked?: (linkId: string) => void;
}) {
  const queryClient = useQueryClient();
  const toast = useToast();
  const revoke = useMutation({
    mutationFn: () => revokeViewerLink(link.id),
    onSuccess: async () => {
      toast.success(`The link for “${link.label}” was revoked; it stops working at once.`);
      onRevoked?.(link.id);
      await queryClient.invalidateQueries({ queryKey: viewerLinkKeys.list(siteId) });
    },
    onError: (error) => toast.error(describeError(error)),
  });
  const ended = status !== 'Active';
  return (
    <tr data-status={status} className={cn(ended && 'opacity-60')}>
      <Td label="Label" className="font-medium text-slate-900 max-sm:break-words">
        {link.label}
      </Td>
      <Td label="Layers">{layerWords(link.layers).join(', ')}</Td>
      <Td label="Well details">{wellDetailWords(link)}</Td>
      <Td label="Created" className="whitespace-nowrap">
        <span>
          <span className="block text-slate-800">{formatDate(link.createdAt)}</span>
          <span className="block text-xs text-slate-500">by {link.createdBy}</span>
        </span>
      </Td>
      <Td label="Expires" className="whitespace-nowrap text-slate-600">
        {formatDate(link.expiresAt)}
        {status === 'Expired' ? <span className="ml-1 text-xs">(expired)</span> : null}
      </Td>
      <Td label="Last viewed" className="whitespace-nowrap text-slate-600">
        {link.lastViewedAt ? <time dateTime={link.lastViewedAt} title={formatDateTime(link.lastViewedAt)}>{formatDate(link.lastViewedAt)}</time> : 'never'}
      </Td>
      <Td label="Views" className="text-right tabular-nums">
        {link.viewCount}
      </Td>
      <Td label="Status">
        <Badge tone={STATUS_TONES[status]}>{status}</Badge>
      </Td>
      <Td label="Actions" className={cn('text-right', ended && 'max-sm:hidden!')}>
        {ended ? null : (
          <ConfirmButton
            aria-label={`Revoke the link for ${link.label}`}
            question="Revoke this link?"
            confirmLabel="Revoke"
            pending={revoke.isPending}
            onConfirm={() => revoke.mutate()}
          >
            Revoke
          </ConfirmButton>
        )}
      </Td>
    </tr>
  );
}
