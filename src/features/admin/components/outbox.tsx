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
import { adminKeys, clearOutbox, outboxQueryOptions } from '../api';

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
          Invitations and password-reset e-mails sent by Kfield appear here.
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
                    <span className="block text-xs text-slate-500">{formatDateTime(message.receivedAt)}</span>
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
          <dt className="text-slate-500">From</dt>
          <dd className="break-all text-slate-800">{message.from}</dd>
          <dt className="text-slate-500">To</dt>
          <dd className="break-all text-slate-800">{message.to.join(', ')}</dd>
          <dt className="text-slate-500">Received</dt>
          <dd className="text-slate-800">{formatDateTime(message.receivedAt)}</dd>
        </dl>
        <div className="rounded-md bg-slate-50 p-4 text-sm leading-relaxed whitespace-pre-wrap break-words text-slate-800 ring-1 ring-slate-200 ring-inset">
          <LinkifiedText text={message.text} />
        </div>
      </CardBody>
    </Card>
  );
}

function ClearOutboxButton() {
  const queryClient = useQueryClient();
  const toast = useToast();
  const mutation = useMutation({
    mutationFn: clearOutbox,
    onSuccess: async () => {
      toast.success('The outbox is empty.');
      await queryClient.invalidateQueries({ queryKey: adminKeys.outbox() });
    },
    onError: (error) => toast.error(describeError(error)),
  });
  return (
    <ConfirmButton
      question="Delete every message in the outbox?"
      confirmLabel="Delete all"
      pending={mutation.isPending}
      onConfirm={() => mutation.mutate()}
    >
      Clear outbox
    </ConfirmButton>
  );
}
