import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { SITE_ROLES } from '@shared/schemas/common';
import { inviteBodySchema } from '@shared/schemas/sites';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { useToast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { applyServerErrors, fieldsOf } from '@/lib/form-errors';
import { inviteMember, memberKeys } from '../api';
import { ROLE_DESCRIPTIONS } from '../roles';

type Values = z.input<typeof inviteBodySchema>;
const inviteFields = fieldsOf<Values>('email', 'role');

export function InviteForm({ siteId }: { siteId: string }) {
  const queryClient = useQueryClient();
  const toast = useToast();
  const {
    register,
    handleSubmit,
    setError,
    reset,
    watch,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof inviteBodySchema>>({
    resolver: zodResolver(inviteBodySchema),
    defaultValues: { email: '', role: 'Viewer' },
  });
  const mutation = useMutation({
    mutationFn: (body: z.output<typeof inviteBodySchema>) => inviteMember(siteId, body),
    onSuccess: async (invitation) => {
      toast.success(`Invitation sent to ${invitation.email}.`);
      reset({ email: '', role: invitation.role });
      await queryClient.invalidateQueries({ queryKey: memberKeys.list(siteId) });
    },
  });

  const onSubmit = handleSubmit((values) =>
    mutation.mutateAsync(values).catch((error: unknown) => {
      if (isApiError(error) && error.code === 'ALREADY_MEMBER' && !error.fields) {
        setError('email', { type: 'server', message: error.message }, { shouldFocus: true });
        return;
      }
      applyServerErrors(error, setError, inviteFields);
    }),
  );

  const role = watch('role');

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <div className="grid gap-4 sm:grid-cols-[1fr_12rem]">
        <TextField
          label="E-mail address"
          type="email"
          autoComplete="off"
          error={errors.email?.message}
          {...register('email')}
        />
        <SelectField label="Role" error={errors.role?.message} {...register('role')}>
          {SITE_ROLES.map((r) => (
            <option key={r} value={r}>
              {r}
            </option>
          ))}
        </SelectField>
      </div>
      {role ? (
        <p className="text-sm text-slate-600">
          <span className="font-medium text-slate-800">{role}</span>: {ROLE_DESCRIPTIONS[role]}.
        </p>
      ) : null}
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" pending={mutation.isPending}>
        Send invitation
      </Button>
    </form>
  );
}
