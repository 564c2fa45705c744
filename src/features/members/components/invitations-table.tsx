import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import type { Invitation } from '@shared/schemas/sites';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { EmptyState } from '@/components/ui/empty-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useToast } from '@/components/ui/toast';
import { describeError } from '@/lib/errors';
import { formatDateTime } from '@/lib/format';
import { memberKeys, membersQueryOptions, revokeInvitation } from '../api';

export function InvitationsTable({ siteId }: { siteId: string }) {
  const { data } = useSuspenseQuery(membersQueryOptions(siteId));
  if (data.invitations.length === 0) {
    return (
      <div className="p-4 sm:p-5">
        <EmptyState title="No pending invitations">Invitations you send appear here until they are accepted.</EmptyState>
      </div>
    );
  }
  return (
    <Table caption="Pending invitations" stackOnMobile>
      <thead>
        <tr>
          <Th>E-mail</Th>
          <Th>Role</Th>
          <Th>Invited by</Th>
          <Th>Expires</Th>
          <Th className="text-right">Actions</Th>
        </tr>
      </thead>
      <tbody>
        {data.invitations.map((invitation) => (
          <InvitationRow key={invitation.id} siteId={siteId} invitation={invitation} />
        ))}
      </tbody>
    </Table>
  );
}

function InvitationRow({ siteId, invitation }: { siteId: string; invitation: Invitation }) {
  const queryClient = useQueryClient();
  const toast = useToast();
  const revoke = useMutation({
    mutationFn: () => revokeInvitation(siteId, invitation.id),
    onSuccess: async () => {
      toast.success(`The invitation for ${invitation.email} was revoked.`);
      await queryClient.invalidateQueries({ queryKey: memberKeys.list(siteId) });
    },
    onError: (error) => toast.error(describeError(error)),
  });
  return (
    <tr>
      <Td label="E-mail" className="whitespace-nowrap font-medium text-slate-900 max-sm:break-all max-sm:whitespace-normal">
        {invitation.email}
      </Td>
      <Td label="Role">{invitation.role}</Td>
      <Td label="Invited by">{invitation.invitedBy}</Td>
      <Td label="Expires" className="whitespace-nowrap text-slate-600">
        {formatDateTime(invitation.expiresAt)}
      </Td>
      <Td label="Actions" className="text-right">
        <ConfirmButton
          aria-label={`Revoke invitation for ${invitation.email}`}
          question={`Revoke the invitation for ${invitation.email}?`}
          confirmLabel="Revoke"
          pending={revoke.isPending}
          onConfirm={() => revoke.mutate()}
        >
          Revoke
        </ConfirmButton>
      </Td>
    </tr>
  );
}
