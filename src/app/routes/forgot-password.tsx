import { Link } from 'react-router-dom';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';
import { AuthCard } from './public-layout';

export function ForgotPasswordRoute() {
  return (
    <AuthCard title="Reset your password" intro="Enter the e-mail address of your account and we will send you a link to choose a new password.">
      <ForgotPasswordForm />
      <p className="mt-6 text-center text-sm">
        <Link to="/sign-in" className="text-accent-700 hover:underline">
          Back to sign in
        </Link>
      </p>
    </AuthCard>
  );
}
