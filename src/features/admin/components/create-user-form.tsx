import { useEffect } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { createUserBodySchema, type AdminUser } from '@shared/schemas/users';
import { loadCommonPasswordCheck, refinePasswordAgainstAccount } from '@shared/schemas/password';
import { Button } from '@/components/ui/button';
import { CheckboxField, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { applyServerErrors, fieldsOf } from '@/lib/form-errors';
import { adminKeys, createUser } from '../api';

type Values = z.input<typeof createUserBodySchema>;
const formSchema = createUserBodySchema.superRefine(refinePasswordAgainstAccount);
const userFields = fieldsOf<Values>('email', 'name', 'isAdmin', 'password');

export function CreateUserForm({
  onCreated,
  onCancel,
}: {
  /** `linkSent`: no first password was given, so the server e-mailed a reset link. */
  onCreated: (user: AdminUser, linkSent: boolean) => void;
  onCancel: () => void;
}) {
  const queryClient = useQueryClient();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof createUserBodySchema>>({
    resolver: zodResolver(formSchema),
    defaultValues: { email: '', name: '', isAdmin: false, password: undefined },
  });
  useEffect(() => void loadCommonPasswordCheck(), []);
  const mutation = useMutation({
    mutationFn: createUser,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: adminKeys.users() });
    },
  });

  const onSubmit = handleSubmit((values) =>
    mutation
      .mutateAsync(values)
      .then(
        (user) => onCreated(user, values.password === undefined),
        (error: unknown) => applyServerErrors(error, setError, userFields),
      ),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...register('name')} />
        <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...register('email')} />
      </div>
      <TextField
        label="First password (optional)"
        type="password"
        autoComplete="new-password"
        hint="To hand over in person. Leave it empty and Kfield e-mails them a link to choose their own."
        error={errors.password?.message}
        {...register('password', { setValueAs: (v: string) => (v === '' ? undefined : v) })}
      />
      <CheckboxField
        label="Instance admin"
        hint="Admins manage users and see every site."
        error={errors.isAdmin?.message}
        {...register('isAdmin')}
      />
      <FormError message={errors.root?.server?.message} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" pending={mutation.isPending}>
          Create user
        </Button>
        <Button variant="ghost" onClick={onCancel} disabled={mutation.isPending}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
