import type { Metadata } from 'next';
import { AuthCard } from '../auth-card';
import { ForgotForm } from './forgot-form';

export const metadata: Metadata = { title: 'Forgot your password' };

export default function ForgotPasswordPage() {
  return (
    <AuthCard title="Reset your password" intro="Enter the address you sign in with; we mail it a link that works once, for an hour.">
      <ForgotForm />
    </AuthCard>
  );
}
