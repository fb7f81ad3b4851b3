import type { Metadata } from 'next';
import { AuthCard } from '../../auth-card';
import { ResetForm } from './reset-form';

export const metadata: Metadata = { title: 'Choose a new password' };

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return (
    <AuthCard title="Choose a new password" intro="At least 10 characters. The link works once.">
      <ResetForm token={token} />
    </AuthCard>
  );
}
