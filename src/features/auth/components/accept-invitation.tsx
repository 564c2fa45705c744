import { useEffect, useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useSuspenseQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import {
  acceptInvitationBodySchema,
  acceptNewAccountFormSchema,
  type InvitationPreview,
  type Me,
} from '@shared/schemas/auth';
import { loadCommonPasswordCheck, refinePasswordAgainstAccount } from '@shared/schemas/password';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { applyServerErrors, fieldsOf } from '@/lib/form-errors';
import { acceptInvitation, invitationQueryOptions } from '../api';

type Props = { token: string; onAccepted: (user: Me, invitation: InvitationPreview) => void };

export function AcceptInvitation({ token, onAccepted }: Props) {
  const { data: invitation } = useSuspenseQuery(invitationQueryOptions(token));
  return (
    <div className="space-y-6">
      <div className="space-y-2 text-sm text-slate-700">
        <p>
          <strong className="font-medium text-slate-900">{invitation.invitedBy}</strong> invited{' '}
          <strong className="font-medium text-slate-900">{invitation.email}</strong> to join{' '}
          <strong className="font-medium text-slate-900">{invitation.siteName}</strong> as{' '}
          <strong className="font-medium text-slate-900">{invitation.role}</strong>.
        </p>
        <p className="text-slate-500">This invitation expires {formatDateTime(invitation.expiresAt)}.</p>
      </div>
      {invitation.accountExists ? (
        <ExistingAccountForm token={token} invitation={invitation} onAccepted={onAccepted} />
      ) : (
        <NewAccountForm token={token} invitation={invitation} onAccepted={onAccepted} />
      )}
    </div>
  );
}

type FormProps = Props & { invitation: InvitationPreview };

const newAccountFields = fieldsOf<z.input<typeof acceptNewAccountFormSchema>>('name', 'password');

function NewAccountForm({ token, invitation, onAccepted }: FormProps) {
  type Values = z.input<typeof acceptNewAccountFormSchema>;
  const schema = useMemo(
    () => acceptNewAccountFormSchema.superRefine((v, ctx) => refinePasswordAgainstAccount({ ...v, email: invitation.email }, ctx)),
    [invitation.email],
  );
  useEffect(() => void loadCommonPasswordCheck(), []);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof acceptNewAccountFormSchema>>({
    resolver: zodResolver(schema),
    defaultValues: { name: '', password: '', confirm: '' },
  });
  const mutation = useMutation({ mutationFn: acceptInvitation });

  const onSubmit = handleSubmit(({ name, password }) =>
    mutation
      .mutateAsync({ token, name, password })
      .then((user) => onAccepted(user, invitation), (error: unknown) => applyServerErrors(error, setError, newAccountFields)),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <p className="text-sm text-slate-600">Create your Kfield account to accept.</p>
      <TextField label="E-mail" type="email" value={invitation.email} readOnly autoComplete="username" />
      <TextField label="Your name" autoComplete="name" autoFocus error={errors.name?.message} {...register('name')} />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint="12 to 72 bytes. A few unrelated words make a strong, memorable password."
        error={errors.password?.message}
        {...register('password')}
      />
      <TextField
        label="Repeat password"
        type="password"
        autoComplete="new-password"
        error={errors.confirm?.message}
        {...register('confirm')}
      />
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" className="w-full" pending={mutation.isPending}>
        Create account and join
      </Button>
    </form>
  );
}

const existingSchema = acceptInvitationBodySchema.pick({ password: true });

function ExistingAccountForm({ token, invitation, onAccepted }: FormProps) {
  type Values = z.input<typeof existingSchema>;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof existingSchema>>({
    resolver: zodResolver(existingSchema),
    defaultValues: { password: '' },
  });
  const mutation = useMutation({ mutationFn: acceptInvitation });

  const onSubmit = handleSubmit(({ password }) =>
    mutation
      .mutateAsync({ token, password })
      .then(
        (user) => onAccepted(user, invitation),
        (error: unknown) => applyServerErrors(error, setError, fieldsOf<Values>('password')),
      ),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <p className="text-sm text-slate-600">You already have a Kfield account. Enter its password to accept.</p>
      <TextField label="E-mail" type="email" value={invitation.email} readOnly autoComplete="username" />
      <TextField
        label="Password"
        type="password"
        autoComplete="current-password"
        autoFocus
        error={errors.password?.message}
        {...register('password')}
      />
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" className="w-full" pending={mutation.isPending}>
        Sign in and join
      </Button>
    </form>
  );
}

/** The title for an error that is about the link itself (unknown, expired, used), or null. */
export function invitationProblemTitle(error: unknown): string | null {
  if (!isApiError(error) || ![400, 404, 410].includes(error.status)) return null;
  if (error.code === 'INVITATION_EXPIRED') return 'This invitation has expired';
  if (error.code === 'INVITATION_USED') return 'This invitation has already been used';
  return 'This invitation link is not valid';
}

export function InvitationProblem({ title, error }: { title: string; error: unknown }) {
  return (
    <Alert tone="error" title={title}>
      {isApiError(error) && error.status === 400 ? (
        <p>Open the link from the e-mail again; it may have been cut short when it was copied.</p>
      ) : isApiError(error) ? (
        <p>{error.message}</p>
      ) : null}
      <p className="mt-2">Ask the site's Lead to send you a new invitation.</p>
    </Alert>
  );
}
