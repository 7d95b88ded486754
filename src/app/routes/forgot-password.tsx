import { AuthLayout } from '@/components/layouts/auth-layout';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';

export function ForgotPasswordRoute() {
  return (
    <AuthLayout title="Reset your password" intro="Enter your e-mail address and we send you a link to choose a new password.">
      <ForgotPasswordForm />
    </AuthLayout>
  );
}
