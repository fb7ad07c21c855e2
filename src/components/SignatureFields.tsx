// The part every signed act shares: the meaning of the signature, its acknowledgement
// and the password re-entered.
import type { FieldErrors, UseFormRegister } from 'react-hook-form';
import { Field, inputClass } from '@/components/Field';

type Signed = { password: string; meaningAcknowledged: true };

export function SignatureFields<T extends Signed>({
  meaning,
  register,
  errors,
  idPrefix,
}: {
  meaning: string;
  register: UseFormRegister<T>;
  errors: FieldErrors<Signed>;
  idPrefix: string;
}) {
  const reg = register as unknown as UseFormRegister<Signed>;
  return (
    <>
      <div className="rounded border border-paper-line bg-paper px-3 py-2 text-sm">
        <p className="text-xs font-medium text-ink-muted">Meaning of your signature</p>
        <p>{meaning}</p>
        <label className="mt-2 flex items-center gap-2 text-sm">
          <input type="checkbox" {...reg('meaningAcknowledged')} /> I have read the meaning of this signature and sign accordingly.
        </label>
        {errors.meaningAcknowledged && <p className="text-xs text-state-fail">{errors.meaningAcknowledged.message}</p>}
      </div>
      <Field label="Your password (re-entered to sign)" htmlFor={`${idPrefix}-password`} error={errors.password?.message}>
        <input id={`${idPrefix}-password`} type="password" autoComplete="current-password" className={`${inputClass} max-w-xs`} {...reg('password')} />
      </Field>
    </>
  );
}
