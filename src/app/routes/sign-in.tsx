import { useNavigate, useSearchParams } from 'react-router-dom';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { useStartSession } from '@/features/auth/hooks';
import { safeNextPath } from '@/lib/safe-next';
import { AuthCard } from './public-layout';

export function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const startSession = useStartSession();
  const next = safeNextPath(params.get('next'));
  return (
    <AuthCard title="Sign in to Kfield" intro="Hydraulic conductivity for your monitoring-well network.">
      <SignInForm
        onSignedIn={(user) => {
          startSession(user);
          navigate(next, { replace: true });
        }}
      />
    </AuthCard>
  );
}
