import { useEffect } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { resetPasswordFormSchema } from '@shared/schemas/auth';
import { loadCommonPasswordCheck } from '@shared/schemas/password';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { isApiError } from '@/lib/api-client';
import { applyServerErrors, fieldsOf } from '@/lib/form-errors';
import { resetPassword } from '../api';

type Values = z.input<typeof resetPasswordFormSchema>;

const PASSWORD_HINT = '12 to 72 bytes. A few unrelated words make a strong, memorable password.';

export function ResetPasswordForm({ token, onDone }: { token: string; onDone: () => void }) {
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof resetPasswordFormSchema>>({
    resolver: zodResolver(resetPasswordFormSchema),
    defaultValues: { password: '', confirm: '' },
  });
  const mutation = useMutation({ mutationFn: resetPassword });
  // The common-password list is a lazy chunk: only the pages that set a password load it.
  useEffect(() => void loadCommonPasswordCheck(), []);

  // A used, expired or unknown link cannot be fixed by retyping the password.
  const tokenProblem = isApiError(mutation.error) ? mutation.error.fields?.token : undefined;
  if (tokenProblem) {
    return (
      <Alert tone="error" title="This reset link cannot be used">
        <p>{tokenProblem}</p>
        <p className="mt-2">
          <Link to="/forgot-password" className="font-medium underline">
            Request a new link
          </Link>
        </p>
      </Alert>
    );
  }

  const onSubmit = handleSubmit((values) =>
    mutation
      .mutateAsync({ token, password: values.password })
      .then(onDone, (error: unknown) => applyServerErrors(error, setError, fieldsOf<Values>('password'))),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        autoFocus
        hint={PASSWORD_HINT}
        error={errors.password?.message}
        {...register('password')}
      />
      <TextField
        label="Repeat new password"
        type="password"
        autoComplete="new-password"
        error={errors.confirm?.message}
        {...register('confirm')}
      />
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" className="w-full" pending={mutation.isPending}>
        Set new password
      </Button>
    </form>
  );
}
