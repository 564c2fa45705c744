import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import { forgotPasswordBodySchema } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { applyServerErrors, fieldsOf } from '@/lib/form-errors';
import { requestPasswordReset } from '../api';

type Values = z.input<typeof forgotPasswordBodySchema>;

export function ForgotPasswordForm() {
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof forgotPasswordBodySchema>>({
    resolver: zodResolver(forgotPasswordBodySchema),
    defaultValues: { email: '' },
  });
  const mutation = useMutation({ mutationFn: requestPasswordReset });

  if (mutation.isSuccess) {
    return (
      <Alert tone="success" title="Check your inbox">
        If an account exists for <strong className="font-medium">{mutation.variables.email}</strong>, we have sent it a
        link to choose a new password. The link works once and expires after a short time.
      </Alert>
    );
  }

  const onSubmit = handleSubmit((values) =>
    mutation.mutateAsync(values).catch((error: unknown) => applyServerErrors(error, setError, fieldsOf<Values>('email'))),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <TextField
        label="E-mail"
        type="email"
        autoComplete="email"
        autoFocus
        error={errors.email?.message}
        {...register('email')}
      />
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" className="w-full" pending={mutation.isPending}>
        Send reset link
      </Button>
    </form>
  );
}
