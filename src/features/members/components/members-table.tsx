import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { SITE_ROLES, siteRoleSchema, type SiteRole } from '@shared/schemas/common';
import type { Member } from '@shared/schemas/sites';
import { Badge } from '@/components/ui/badge';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { InlineSelect } from '@/components/ui/field';
import { Table, Td, Th } from '@/components/ui/table';
import { useToast } from '@/components/ui/toast';
import { describeError } from '@/lib/errors';
import { formatDate } from '@/lib/format';
import { changeMemberRole, memberKeys, membersQueryOptions, removeMember } from '../api';

type Props = {
  siteId: string;
  canManage: boolean;
  myUserId: string;
  /** Roles and member counts live on the site too; the caller refreshes what it shows. */
  onMembershipChanged: () => void;
  onLeftSite: () => void;
};

export function MembersTable(props: Props) {
  const { data } = useSuspenseQuery(membersQueryOptions(props.siteId));
  // Viewers are not shown members' addresses (the server leaves them out).
  const showEmail = data.members.some((m) => m.email !== null);
  return (
    <Table caption="Site members" minWidth={props.canManage ? 'min-w-[44rem]' : 'min-w-[32rem]'} stackOnMobile>
      <thead>
        <tr>
          <Th>Name</Th>
          {showEmail ? <Th>E-mail</Th> : null}
          <Th>Role</Th>
          <Th>Member since</Th>
          {props.canManage ? <Th className="text-right">Actions</Th> : null}
        </tr>
      </thead>
      <tbody>
        {data.members.map((member) => (
          <MemberRow key={member.userId} member={member} showEmail={showEmail} {...props} />
        ))}
      </tbody>
    </Table>
  );
}

function MemberRow({ member, showEmail, siteId, canManage, myUserId, onMembershipChanged, onLeftSite }: Props & { member: Member; showEmail: boolean }) {
  const queryClient = useQueryClient();
  const toast = useToast();
  const isMe = member.userId === myUserId;

  const roleChange = useMutation({
    mutationFn: (role: SiteRole) => changeMemberRole(siteId, member.userId, role),
    onSuccess: (saved) => toast.success(`${saved.name} is now ${saved.role}.`),
    onError: (error) => toast.error(describeError(error)),
    onSettled: async () => {
      await queryClient.invalidateQueries({ queryKey: memberKeys.list(siteId) });
      onMembershipChanged();
    },
  });

  const removal = useMutation({
    mutationFn: () => removeMember(siteId, member.userId),
    onSuccess: async () => {
      toast.success(isMe ? 'You have left this site.' : `${member.name} was removed from this site.`);
      if (isMe) {
        onLeftSite();
        return;
      }
      await queryClient.invalidateQueries({ queryKey: memberKeys.list(siteId) });
      onMembershipChanged();
    },
    onError: (error) => toast.error(describeError(error)),
  });

  const shownRole = roleChange.isPending ? roleChange.variables : member.role;

  return (
    <tr>
      <Td label="Name">
        <span>
          <span className="font-medium text-slate-900">{member.name}</span>
          {isMe ? <span className="ml-2 text-xs text-slate-500">(you)</span> : null}
          {member.disabled ? (
            <Badge tone="warning" className="ml-2">
              Account disabled
            </Badge>
          ) : null}
        </span>
      </Td>
      {showEmail ? (
        <Td label="E-mail" className="whitespace-nowrap max-sm:break-all max-sm:whitespace-normal">
          {member.email}
        </Td>
      ) : null}
      <Td label="Role">
        {canManage ? (
          <InlineSelect
            label={`Role for ${member.name}`}
            value={shownRole}
            disabled={roleChange.isPending || removal.isPending}
            onChange={(event) => {
              const role = siteRoleSchema.parse(event.target.value);
              if (role !== member.role) roleChange.mutate(role);
            }}
          >
            {SITE_ROLES.map((role) => (
              <option key={role} value={role}>
                {role}
              </option>
            ))}
          </InlineSelect>
        ) : (
          <Badge tone={member.role === 'Lead' ? 'accent' : 'neutral'}>{member.role}</Badge>
        )}
      </Td>
      <Td label="Member since" className="whitespace-nowrap text-slate-600">{formatDate(member.since)}</Td>
      {canManage ? (
        <Td label="Actions" className="text-right">
          <ConfirmButton
            aria-label={isMe ? 'Leave this site' : `Remove ${member.name}`}
            question={isMe ? 'Leave this site?' : `Remove ${member.name}?`}
            confirmLabel={isMe ? 'Leave' : 'Remove'}
            pending={removal.isPending}
            disabled={roleChange.isPending}
            onConfirm={() => removal.mutate()}
          >
            {isMe ? 'Leave' : 'Remove'}
          </ConfirmButton>
        </Td>
      ) : null}
    </tr>
  );
}
