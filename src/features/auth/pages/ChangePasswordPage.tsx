import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { PASSWORD_HINT } from '@shared/schemas/password';
import { passwordChangeSchema, type PasswordChangeInput } from '@shared/schemas/auth';
import { Button } from '@/components/Button';
import { Field } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { PasswordInput } from '@/components/PasswordInput';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useChangePassword } from '../api/password';

export function ChangePasswordPage() {
  const change = useChangePassword();
  const form = useForm<PasswordChangeInput>({ resolver: zodResolver(passwordChangeSchema), defaultValues: { currentPassword: '', newPassword: '' } });
  const errors = form.formState.errors;
  const submit = form.handleSubmit((values) =>
    change.mutate(values, {
      onSuccess: () => form.reset(),
      onError: (error) => showServerFieldErrors(error, form.setError),
    }),
  );
  const busy = change.isPending || form.formState.isSubmitting;

  return (
    <div>
      <PageHeader title="Your password" subtitle="Changing it signs you out of every other browser and device; this one stays signed in." />
      <form onSubmit={submit} noValidate aria-label="Change password" className="max-w-sm space-y-4">
        {change.isSuccess && <Notice tone="info">Your password is changed. Your other sessions have ended.</Notice>}
        {change.error && !Object.keys(errors).length && <Notice tone="error">{change.error.message}</Notice>}
        <Field label="Current password" htmlFor="current-password" error={errors.currentPassword?.message}>
          <PasswordInput id="current-password" autoComplete="current-password" {...form.register('currentPassword')} />
        </Field>
        <Field label="New password" htmlFor="new-password" error={errors.newPassword?.message} hint={PASSWORD_HINT}>
          <PasswordInput id="new-password" autoComplete="new-password" {...form.register('newPassword')} />
        </Field>
        <Button type="submit" disabled={busy}>
          {busy ? 'Checking…' : 'Change password'}
        </Button>
      </form>
    </div>
  );
}
