import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { passwordResetRequestSchema, type PasswordResetRequestInput } from '@shared/schemas/auth';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useRequestPasswordReset } from '../api/password';
import { AuthFrame } from '../components/AuthFrame';

export function ForgotPasswordPage() {
  const request = useRequestPasswordReset();
  const form = useForm<PasswordResetRequestInput>({ resolver: zodResolver(passwordResetRequestSchema), defaultValues: { email: '' } });
  const submit = form.handleSubmit((values) => request.mutate(values));

  return (
    <AuthFrame>
      <form onSubmit={submit} noValidate className="space-y-4" aria-label="Forgotten password">
        <div>
          <h1>Forgotten password</h1>
          <p className="text-sm text-ink-muted">Enter the e-mail address of your account. We mail you a link to choose a new password.</p>
        </div>
        {request.error && <Notice tone="error">{request.error.message}</Notice>}
        {request.data ? (
          <Notice tone="info" title="Check your mail">
            {request.data.message}
          </Notice>
        ) : (
          <>
            <Field label="E-mail" htmlFor="email" error={form.formState.errors.email?.message}>
              <input id="email" type="email" autoComplete="username" className={inputClass} {...form.register('email')} />
            </Field>
            <Button type="submit" className="w-full justify-center" disabled={request.isPending}>
              {request.isPending ? 'Sending…' : 'Mail me a link'}
            </Button>
          </>
        )}
        <p className="text-center text-sm">
          <Link to="/sign-in">Back to sign-in</Link>
        </p>
      </form>
    </AuthFrame>
  );
}
