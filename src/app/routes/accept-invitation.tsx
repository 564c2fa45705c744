import { useNavigate, useParams } from 'react-router-dom';
import { QueryBoundary, RegionError } from '@/components/ui/error-boundary';
import { useToast } from '@/components/ui/toast';
import { AcceptInvitation, InvitationProblem, invitationProblemTitle } from '@/features/auth/components/accept-invitation';
import { useStartSession } from '@/features/auth/hooks';
import { AuthCard } from './public-layout';

export function AcceptInvitationRoute() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const toast = useToast();
  const startSession = useStartSession();
  return (
    <AuthCard title="Accept invitation">
      <QueryBoundary
        loadingLabel="Opening the invitation…"
        renderError={(props) => {
          const title = invitationProblemTitle(props.error);
          return title ? <InvitationProblem title={title} error={props.error} /> : <RegionError {...props} />;
        }}
      >
        <AcceptInvitation
          token={token}
          onAccepted={(user, invitation) => {
            startSession(user);
            toast.success(`Welcome to ${invitation.siteName}. You have joined as ${invitation.role}.`);
            navigate('/', { replace: true });
          }}
        />
      </QueryBoundary>
    </AuthCard>
  );
}
