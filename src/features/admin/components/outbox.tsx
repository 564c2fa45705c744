import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { OutboxMessage } from '@shared/schemas/users';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { EmptyState } from '@/components/ui/empty-state';
import { useToast } from '@/components/ui/toast';
import { cn } from '@/lib/cn';
import { describeError } from '@/lib/errors';
import { formatDateTime } from '@/lib/format';
import { LinkifiedText } from '@/lib/linkify';
import { Badge } from '@/components/ui/badge';
import { adminKeys, clearOutbox, outboxQueryOptions, retryOutboxMessage } from '../api';

/** `messageHref(id)` builds the link that opens one message; the route owns the URL. */
export function Outbox({ selectedId, messageHref, listHref }: { selectedId: string | null; messageHref: (id: string) => string; listHref: string }) {
  const { data: messages, refetch, isRefetching } = useSuspenseQuery(outboxQueryOptions());
  const selected = selectedId ? (messages.find((m) => m.id === selectedId) ?? null) : null;

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-2">
        <Button variant="secondary" size="sm" pending={isRefetching} onClick={() => void refetch()}>
          Refresh
        </Button>
        {messages.length > 0 ? <ClearOutboxButton /> : null}
      </div>
      {messages.length === 0 ? (
        <EmptyState title="The outbox is empty">
          Invitations, password-reset and fit e-mails appear here as soon as Kfield queues them, with their delivery.
        </EmptyState>
      ) : (
        <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
          <Card as="div" className={cn('overflow-hidden', selected && 'hidden lg:block')}>
            <ul aria-label="Messages" className="divide-y divide-slate-100">
              {messages.map((message) => (
                <li key={message.id}>
                  <Link
                    to={messageHref(message.id)}
                    aria-current={message.id === selected?.id ? 'true' : undefined}
                    className={cn(
                      'block px-4 py-3 hover:bg-slate-50',
                      message.id === selected?.id && 'bg-accent-50 hover:bg-accent-50',
                    )}
                  >
                    <span className="block truncate text-sm font-medium text-slate-900">{message.subject || '(no subject)'}</span>
                    <span className="block truncate text-xs text-slate-600">To {message.to.join(', ')}</span>
                    <span className="mt-1 flex items-center gap-2 text-xs text-slate-500">
                      <StatusBadge message={message} />
                      {formatDateTime(message.createdAt)}
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          </Card>
          {selected ? (
            <MessageView message={selected} listHref={listHref} />
          ) : selectedId ? (
            <EmptyState title="This message is no longer in the outbox" />
          ) : (
            <div className="hidden lg:block">
              <EmptyState title="Choose a message to read it" />
            </div>
          )}
        </div>
      )}
    </div>
  );
}

function MessageView({ message, listHref }: { message: OutboxMessage; listHref: string }) {
  return (
    <Card as="article" aria-labelledby="outbox-message-subject" className="min-w-0 self-start">
      <CardHeader
        titleId="outbox-message-subject"
        title={message.subject || '(no subject)'}
        actions={
          <Link to={listHref} className="text-sm text-accent-700 hover:underline lg:hidden">
            Back to messages
          </Link>
        }
      />
      <CardBody className="space-y-4">
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-slate-500">To</dt>
          <dd className="break-all text-slate-800">{message.to.join(', ')}</dd>
          <dt className="text-slate-500">Queued</dt>
          <dd className="text-slate-800">{formatDateTime(message.createdAt)}</dd>
          <dt className="text-slate-500">Delivery</dt>
          <dd className="text-slate-800">
            <StatusBadge message={message} /> <DeliveryText message={message} />
          </dd>
          {message.lastError ? (
            <>
              <dt className="text-slate-500">Last error</dt>
              <dd className="break-words text-slate-800">{message.lastError}</dd>
            </>
          ) : null}
        </dl>
        {message.status === 'failed' ? <RetryButton messageId={message.id} /> : null}
        <div className="rounded-md bg-slate-50 p-4 text-sm leading-relaxed whitespace-pre-wrap break-words text-slate-800 ring-1 ring-slate-200 ring-inset">
          <LinkifiedText text={message.text} />
        </div>
      </CardBody>
    </Card>
  );
}

const STATUS_LABEL: Record<OutboxMessage['status'], string> = { pending: 'Waiting', sending: 'Sending', sent: 'Sent', failed: 'Not delivered' };
const STATUS_TONE = { pending: 'warning', sending: 'warning', sent: 'accent', failed: 'danger' } as const;

function StatusBadge({ message }: { message: OutboxMessage }) {
  return <Badge tone={STATUS_TONE[message.status]}>{STATUS_LABEL[message.status]}</Badge>;
}

function DeliveryText({ message }: { message: OutboxMessage }) {
  const tries = `${message.attempts} attempt${message.attempts === 1 ? '' : 's'}`;
  if (message.status === 'sent') return <>to the mail relay {message.sentAt ? formatDateTime(message.sentAt) : ''} ({tries})</>;
  if (message.status === 'failed') return <>the relay refused it {tries}; Kfield stopped trying</>;
  if (message.status === 'sending') return <>being handed to the relay</>;
  return <>{message.attempts ? `${tries} so far; next ` : 'due '}{message.nextAttemptAt ? formatDateTime(message.nextAttemptAt) : 'now'}</>;
}

function RetryButton({ messageId }: { messageId: string }) {
  const queryClient = useQueryClient();
  const toast = useToast();
  const mutation = useMutation({
    mutationFn: () => retryOutboxMessage(messageId),
    onSuccess: async () => {
      toast.success('The message is queued again.');
      await queryClient.invalidateQueries({ queryKey: adminKeys.outbox() });
    },
    onError: (error) => toast.error(describeError(error)),
  });
  return (
    <Button variant="secondary" size="sm" pending={mutation.isPending} onClick={() => mutation.mutate()}>
      Try again now
    </Button>
  );
}

function ClearOutboxButton() {
  const queryClient = useQueryClient();
  const toast = useToast();
  const mutation = useMutation({
    mutationFn: clearOutbox,
    onSuccess: async () => {
      toast.success('Sent and undelivered messages were removed; waiting ones stay.');
      await queryClient.invalidateQueries({ queryKey: adminKeys.outbox() });
    },
    onError: (error) => toast.error(describeError(error)),
  });
  return (
    <ConfirmButton
      question="Remove every sent and undelivered message? Messages still waiting stay."
      confirmLabel="Remove"
      pending={mutation.isPending}
      onConfirm={() => mutation.mutate()}
    >
      Remove sent messages
    </ConfirmButton>
  );
}
