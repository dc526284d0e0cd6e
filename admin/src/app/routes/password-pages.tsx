import { Link, useSearchParams } from 'react-router-dom';
import { Wordmark } from '@/components/ui/wordmark';
import { Notice } from '@/components/ui/states';
import { ChooseNewPasswordForm } from '@/features/account/components/choose-new-password-form';
import { RequestResetForm } from '@/features/account/components/request-reset-form';

function PublicCard({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <main className="flex min-h-dvh items-start justify-center px-4 pt-[14vh]">
      <title>{`${title} · Evenhand`}</title>
      <div className="w-full max-w-sm">
        <div className="mb-5 flex items-center gap-2">
          <Wordmark className="size-8 text-spruce" />
          <span className="text-2xl font-semibold tracking-tight">Evenhand</span>
          <span className="text-sm text-ink-muted">for lab staff</span>
        </div>
        <div className="rounded-lg border border-line bg-surface p-6 shadow-raised">
          <h1 className="mb-4 text-lg font-semibold">{title}</h1>
          {children}
        </div>
        <p className="mt-4 text-sm">
          <Link to="/sign-in" className="font-medium text-spruce-ink underline underline-offset-2 hover:text-spruce">
            Back to sign-in
          </Link>
        </p>
      </div>
    </main>
  );
}

export function ForgotPasswordPage() {
  return (
    <PublicCard title="Forgot your password?">
      <p className="mb-4 text-sm text-ink-muted">
        Enter the e-mail you sign in with, and we send a link to choose a new password.
      </p>
      <RequestResetForm />
    </PublicCard>
  );
}

export function ResetPasswordPage() {
  const [searchParams] = useSearchParams();
  const token = searchParams.get('token') ?? '';
  return (
    <PublicCard title="Choose a new password">
      {token.length < 20 ? (
        <Notice>
          This link is incomplete. Open the whole link from the e-mail, or{' '}
          <Link to="/forgot-password" className="font-medium underline underline-offset-2">
            ask for a new one
          </Link>
          .
        </Notice>
      ) : (
        <ChooseNewPasswordForm token={token} />
      )}
    </PublicCard>
  );
}
