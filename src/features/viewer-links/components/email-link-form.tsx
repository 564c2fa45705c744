import { useForm, type Path } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { VIEWER_LINK_MAX_ADDRESSES } from '@shared/schemas/viewer-links';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { useToast } from '@/components/ui/toast';
import { applyServerErrors } from '@/lib/form-errors';
import { plural } from '@/lib/format';
import { emailViewerLink } from '../api';
import { readAddresses } from './addresses';

const emailFormSchema = z.object({
  addresses: z.string().transform((text, ctx) => {
    const read = readAddresses(text);
    if (read.error !== null) {
      ctx.addIssue({ code: 'custom', message: read.error });
      return z.NEVER;
    }
    return read.addresses;
  }),
});
type Values = z.input<typeof emailFormSchema>;

/** The server names the addresses "to" or "to.3": all of them are this one box. */
const mapEmailField = (serverField: string): Path<Values> | null => (serverField === 'to' || serverField.startsWith('to.') ? 'addresses' : null);

/** `url` is the one shown at creation; the server checks it against the link's hash before queueing. */
export function EmailLinkForm({ linkId, url, showOutboxHint }: { linkId: string; url: string; showOutboxHint: boolean }) {
  const toast = useToast();
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof emailFormSchema>>({
    resolver: zodResolver(emailFormSchema),
    defaultValues: { addresses: '' },
  });
  const mutation = useMutation({
    mutationFn: (to: string[]) => emailViewerLink(linkId, { to, url }),
    onSuccess: ({ queued, held }) => {
      const messages = plural(queued, 'message', 'messages');
      const queuedText = queued === 0 ? 'No message queued' : showOutboxHint ? `Queued ${messages} — see Admin → Outbox` : `Queued ${messages}; Kfield sends ${queued === 1 ? 'it' : 'them'} in a moment`;
      const heldText =
        held.length > 0 ? ` Not sent now to ${held.join(', ')}: Kfield mailed this link there minutes ago, or the address has had enough mail from Kfield today.` : '';
      toast[queued === 0 ? 'info' : 'success'](`${queuedText}.${heldText}`);
      reset({ addresses: '' });
    },
  });

  const onSubmit = handleSubmit(({ addresses }) => mutation.mutateAsync(addresses).catch((error: unknown) => applyServerErrors(error, setError, mapEmailField)));

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3">
      <TextAreaField
        label="E-mail addresses"
        autoComplete="off"
        spellCheck={false}
        hint={`Separate them with commas, spaces or new lines; at most ${VIEWER_LINK_MAX_ADDRESSES}. Each address gets its own message.`}
        error={errors.addresses?.message}
        {...register('addresses')}
      />
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" variant="secondary" pending={mutation.isPending}>
        Send link
      </Button>
    </form>
  );
}
