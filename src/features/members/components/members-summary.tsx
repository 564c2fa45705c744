import { useSuspenseQuery } from '@tanstack/react-query';
import { Badge } from '@/components/ui/badge';
import { membersQueryOptions } from '../api';

/** The overview's short list: who is on the site and in which role. */
export function MembersSummary({ siteId }: { siteId: string }) {
  const { data } = useSuspenseQuery(membersQueryOptions(siteId));
  const pending = data.invitations.length;
  return (
    <div className="space-y-3">
      <ul className="divide-y divide-slate-100" aria-label="Members">
        {data.members.map((member) => (
          <li key={member.userId} className="flex items-center justify-between gap-3 py-2">
            <span className="min-w-0">
              <span className="block truncate text-sm font-medium text-slate-900">{member.name}</span>
              {member.email ? <span className="block truncate text-xs text-slate-500">{member.email}</span> : null}
            </span>
            <Badge tone={member.role === 'Lead' ? 'accent' : 'neutral'}>{member.role}</Badge>
          </li>
        ))}
      </ul>
      {pending > 0 ? (
        <p className="text-sm text-slate-600">
          {pending === 1 ? '1 invitation is' : `${pending} invitations are`} waiting to be accepted.
        </p>
      ) : null}
    </div>
  );
}
