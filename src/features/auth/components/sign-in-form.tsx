import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { loginBodySchema, type Me } from '@shared/schemas/auth';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { applyServerErrors, fieldsOf } from '@/lib/form-errors';
import { login } from '../api';

type Values = z.input<typeof loginBodySchema>;

export function SignInForm({ onSignedIn }: { onSignedIn: (user: Me) => void }) {
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof loginBodySchema>>({
    resolver: zodResolver(loginBodySchema),
    defaultValues: { email: '', password: '' },
  });
  const mutation = useMutation({ mutationFn: login });

  const onSubmit = handleSubmit((values) =>
    mutation.mutateAsync(values).then(onSignedIn, (error: unknown) =>
      applyServerErrors(error, setError, fieldsOf<Values>('email', 'password')),
    ),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        autoFocus
        error={errors.email?.message}
        {...register('email')}
      />
      <div className="space-y-1.5">
        <TextField
          label="Password"
          type="password"
          autoComplete="current-password"
          error={errors.password?.message}
          {...register('password')}
        />
        <p className="text-right text-sm">
          <Link to="/forgot-password" className="text-accent-700 hover:underline">
            Forgot password?
          </Link>
        </p>
      </div>
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" className="w-full" pending={mutation.isPending}>
        Sign in
      </Button>
    </form>
  );
}
