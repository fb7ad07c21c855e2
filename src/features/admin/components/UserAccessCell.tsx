import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Lock } from 'lucide-react';
import { PASSWORD_HINT } from '@shared/schemas/password';
import { userUpdateSchema, type UserView } from '@shared/schemas/users';
import { Button } from '@/components/Button';
import { Field } from '@/components/Field';
import { PasswordInput } from '@/components/PasswordInput';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useSendResetLink, useUnlockSigning, useUpdateUser } from '../api';
import { formatTime } from '@shared/format';

const setPasswordSchema = userUpdateSchema.pick({ password: true }).required();
type SetPasswordInput = { password: string };

function SetPasswordForm({ user, onDone }: { user: UserView; onDone: (saved: boolean) => void }) {
  const update = useUpdateUser();
  const form = useForm<SetPasswordInput>({ resolver: zodResolver(setPasswordSchema), defaultValues: { password: '' } });
  const submit = form.handleSubmit((values) =>
    update.mutate({ id: user.id, ...values }, { onSuccess: () => onDone(true), onError: (error) => showServerFieldErrors(error, form.setError) }),
  );
  const error = form.formState.errors.password?.message ?? (update.error && !form.formState.errors.password ? update.error.message : undefined);
  return (
    <form onSubmit={submit} noValidate aria-label={`New password for ${user.name}`} className="w-64 space-y-1.5">
      <Field label="New password" htmlFor={`set-password-${user.id}`} error={error} hint={`${PASSWORD_HINT} Ends the user's sessions.`}>
        <PasswordInput id={`set-password-${user.id}`} autoComplete="new-password" {...form.register('password')} />
      </Field>
      <div className="flex gap-1">
        <Button type="submit" className="!py-0.5" disabled={update.isPending || form.formState.isSubmitting}>
          Set password
        </Button>
        <Button look="quiet" className="!py-0.5" onClick={() => onDone(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

/** Password and signing of one account: mail a reset link, set a password, lift a signing lock. */
export function UserAccessCell({ user }: { user: UserView }) {
  const [setting, setSetting] = useState(false);
  const [passwordSet, setPasswordSet] = useState(false);
  const sendLink = useSendResetLink();
  const unlock = useUnlockSigning();
  if (setting) {
    return (
      <SetPasswordForm
        user={user}
        onDone={(saved) => {
          setSetting(false);
          setPasswordSet(saved);
        }}
      />
    );
  }
  return (
    <div className="space-y-1">
      {user.signingLockedUntil && (
        <div className="flex flex-wrap items-center gap-2">
          <span className="inline-flex items-center gap-1 text-state-fail">
            <Lock className="h-3.5 w-3.5" aria-hidden /> Signing locked until {formatTime(user.signingLockedUntil)}
          </span>
          <Button look="quiet" className="!px-1.5 !py-0 text-xs" disabled={unlock.isPending} onClick={() => unlock.mutate(user.id)}>
            Unlock signing
          </Button>
        </div>
      )}
      <div className="flex flex-wrap gap-1">
        <Button look="quiet" className="!px-1.5 !py-0 text-xs" disabled={!user.active || sendLink.isPending} onClick={() => sendLink.mutate(user.id)}>
          Mail reset link
        </Button>
        <Button look="quiet" className="!px-1.5 !py-0 text-xs" onClick={() => setSetting(true)}>
          Set password
        </Button>
      </div>
      {sendLink.data && (
        <p className="text-xs text-ink-muted" role="status">
          {sendLink.data.message}
        </p>
      )}
      {passwordSet && (
        <p className="text-xs text-ink-muted" role="status">
          Password set. The user's sessions have ended.
        </p>
      )}
      {(sendLink.error ?? unlock.error) && <p className="text-xs text-state-fail">{(sendLink.error ?? unlock.error)!.message}</p>}
    </div>
  );
}
