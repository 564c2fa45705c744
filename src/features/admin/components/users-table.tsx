import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import type { AdminUser, UserPatch } from '@shared/schemas/users';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Table, Td, Th } from '@/components/ui/table';
import { useToast } from '@/components/ui/toast';
import { describeError } from '@/lib/errors';
import { formatDateTime } from '@/lib/format';
import { adminKeys, sendPasswordReset, updateUser, usersQueryOptions } from '../api';

export function UsersTable({ myUserId }: { myUserId: string }) {
  const { data: users } = useSuspenseQuery(usersQueryOptions());
  return (
    <Table caption="Users" minWidth="min-w-[60rem]" stackOnMobile>
      <thead>
        <tr>
          <Th>Name</Th>
          <Th>E-mail</Th>
          <Th>Sites</Th>
          <Th>Last sign-in</Th>
          <Th>Admin</Th>
          <Th>Status</Th>
          <Th className="text-right">Actions</Th>
        </tr>
      </thead>
      <tbody>
        {users.map((user) => (
          <UserRow key={user.id} user={user} isMe={user.id === myUserId} />
        ))}
      </tbody>
    </Table>
  );
}

function UserRow({ user, isMe }: { user: AdminUser; isMe: boolean }) {
  const queryClient = useQueryClient();
  const toast = useToast();

  const patch = useMutation({
    mutationFn: (body: UserPatch) => updateUser(user.id, body),
    onSuccess: (saved, body) => {
      queryClient.setQueryData(adminKeys.users(), (old: AdminUser[] | undefined) =>
        old?.map((u) => (u.id === saved.id ? saved : u)),
      );
      if (body.disabled !== undefined) toast.success(`${saved.name} is ${saved.disabled ? 'disabled' : 'enabled'}.`);
      if (body.isAdmin !== undefined) toast.success(`${saved.name} is ${saved.isAdmin ? 'now' : 'no longer'} an instance admin.`);
    },
    onError: (error) => toast.error(describeError(error)),
    onSettled: () => queryClient.invalidateQueries({ queryKey: adminKeys.users() }),
  });

  const reset = useMutation({
    mutationFn: () => sendPasswordReset(user.id),
    onSuccess: () => toast.success(`A password reset link was e-mailed to ${user.email}.`),
    onError: (error) => toast.error(describeError(error)),
  });

  const shownAdmin = patch.isPending && patch.variables.isAdmin !== undefined ? patch.variables.isAdmin : user.isAdmin;

  return (
    <tr className={user.disabled ? 'bg-slate-50' : undefined}>
      <Td label="Name">
        <span>
          <span className="font-medium text-slate-900">{user.name}</span>
          {isMe ? <span className="ml-2 text-xs text-slate-500">(you)</span> : null}
        </span>
      </Td>
      <Td label="E-mail" className="whitespace-nowrap max-sm:break-all max-sm:whitespace-normal">
        {user.email}
      </Td>
      <Td label="Sites">
        {user.memberships.length > 0 ? (
          <ul className="space-y-0.5">
            {user.memberships.map((m) => (
              <li key={m.siteId} className="text-slate-700">
                {m.siteName} <span className="text-slate-500">({m.role})</span>
              </li>
            ))}
          </ul>
        ) : (
          <span className="text-slate-400">None</span>
        )}
      </Td>
      <Td label="Last sign-in" className="whitespace-nowrap text-slate-600">
        {user.lastSignInAt ? formatDateTime(user.lastSignInAt) : <span className="text-slate-400">Never</span>}
      </Td>
      <Td label="Admin">
        <label className="inline-flex items-center gap-2">
          <input
            type="checkbox"
            className="size-4 accent-accent-700"
            checked={shownAdmin}
            disabled={isMe || patch.isPending}
            aria-label={`Instance admin: ${user.name}`}
            title={isMe ? 'You cannot remove your own admin rights' : undefined}
            onChange={(event) => patch.mutate({ isAdmin: event.target.checked })}
          />
          <span className="text-slate-700" aria-hidden="true">
            {shownAdmin ? 'Yes' : 'No'}
          </span>
        </label>
      </Td>
      <Td label="Status">{user.disabled ? <Badge tone="warning">Disabled</Badge> : <Badge tone="accent">Active</Badge>}</Td>
      <Td label="Actions" className="text-right">
        <div className="flex flex-wrap justify-end gap-2">
          <Button
            variant={user.disabled ? 'secondary' : 'danger'}
            size="sm"
            disabled={isMe}
            pending={patch.isPending && patch.variables.disabled !== undefined}
            aria-label={`${user.disabled ? 'Enable' : 'Disable'} ${user.name}`}
            onClick={() => patch.mutate({ disabled: !user.disabled })}
          >
            {user.disabled ? 'Enable' : 'Disable'}
          </Button>
          <Button
            variant="secondary"
            size="sm"
            disabled={user.disabled}
            title={user.disabled ? 'Enable the account before sending it a reset link' : undefined}
            pending={reset.isPending}
            aria-label={`Send reset link to ${user.name}`}
            onClick={() => reset.mutate()}
          >
            Send reset link
          </Button>
        </div>
      </Td>
    </tr>
  );
}
