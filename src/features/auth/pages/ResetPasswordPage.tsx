import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link, useLocation } from 'react-router-dom';
import { PASSWORD_HINT } from '@shared/schemas/password';
import { passwordResetSchema, type PasswordResetInput } from '@shared/schemas/auth';
import { Button } from '@/components/Button';
import { Field } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PasswordInput } from '@/components/PasswordInput';
import { ApiError } from '@/lib/api';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useResetPassword } from '../api/password';
import { AuthFrame } from '../components/AuthFrame';

/** The page a mailed reset link opens; the token travels in the address's fragment. */
export function ResetPasswordPage() {
  const token = new URLSearchParams(useLocation().hash.slice(1)).get('token') ?? '';
  const reset = useResetPassword();
  const form = useForm<PasswordResetInput>({ resolver: zodResolver(passwordResetSchema), defaultValues: { token, newPassword: '' } });
  const submit = form.handleSubmit((values) => reset.mutate(values, { onError: (error) => showServerFieldErrors(error, form.setError) }));
  const busy = reset.isPending || form.formState.isSubmitting;
  // A link that cannot be used (missing, unknown, used, expired) leaves nothing to type.
  const deadLink = !token
    ? 'This page opens from the link in the reset mail, and the link here is incomplete.'
    : (form.formState.errors.token?.message ??
      (reset.error instanceof ApiError && reset.error.code.startsWith('reset_link_') ? reset.error.message : undefined));

  return (
    <AuthFrame>
      <form onSubmit={submit} noValidate className="space-y-4" aria-label="Choose a new password">
        <div>
          <h1>Choose a new password</h1>
          <p className="text-sm text-ink-muted">Choosing it signs your account out everywhere.</p>
        </div>
        {reset.isSuccess ? (
          <Notice tone="info" title="Password changed">
            Sign in with your new password.
          </Notice>
        ) : deadLink ? (
          <Notice tone="error">
            {deadLink} <Link to="/forgot-password">Ask for a new link</Link>
          </Notice>
        ) : (
          <>
            {reset.error && !form.formState.errors.newPassword && <Notice tone="error">{reset.error.message}</Notice>}
            <Field label="New password" htmlFor="new-password" error={form.formState.errors.newPassword?.message} hint={PASSWORD_HINT}>
              <PasswordInput id="new-password" autoComplete="new-password" {...form.register('newPassword')} />
            </Field>
            <Button type="submit" className="w-full justify-center" disabled={busy}>
              {busy ? 'Checking…' : 'Set new password'}
            </Button>
          </>
        )}
        <p className="text-center text-sm">
          <Link to="/sign-in">{reset.isSuccess ? 'Sign in' : 'Back to sign-in'}</Link>
        </p>
      </form>
    </AuthFrame>
  );
}
