import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { useToast } from '@/components/ui/toast';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';
import { AuthCard } from './public-layout';

export function ResetPasswordRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const toast = useToast();
  const token = params.get('token') ?? '';
  return (
    <AuthCard title="Choose a new password">
      {token ? (
        <ResetPasswordForm
          token={token}
          onDone={() => {
            toast.success('Your password has been changed. Sign in with the new one.');
            navigate('/sign-in', { replace: true });
          }}
        />
      ) : (
        <Alert tone="error" title="This reset link is incomplete">
          <p>Open the link from the e-mail again, or request a new one.</p>
          <p className="mt-2">
            <Link to="/forgot-password" className="font-medium underline">
              Request a new link
            </Link>
          </p>
        </Alert>
      )}
      <p className="mt-6 text-center text-sm">
        <Link to="/sign-in" className="text-accent-700 hover:underline">
          Back to sign in
        </Link>
      </p>
    </AuthCard>
  );
}
