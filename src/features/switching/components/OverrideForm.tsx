// The quality manager puts a supplier and part on a severity for a stated reason, in place of what
// the switching rules reached. Signed; the counts start again from the new severity.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { SEVERITIES, type Severity } from '@shared/sampling';
import { OVERRIDE_MEANING, SWITCHING_PHASE_LABELS, severityOverrideSchema, type SeverityOverrideInput } from '@shared/schemas/switching';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useOverrideSeverity } from '../api';
import { SignatureFields } from '@/components/SignatureFields';

type Props = { supplierId: number; partId: number; current: Severity; onSigned(severity: Severity): void; onCancel(): void };

export function OverrideForm({ supplierId, partId, current, onSigned, onCancel }: Props) {
  const override = useOverrideSeverity(supplierId, partId);
  const form = useForm<SeverityOverrideInput>({
    resolver: zodResolver(severityOverrideSchema),
    defaultValues: { severity: undefined, reason: '', password: '', meaningAcknowledged: false as unknown as true },
  });
  const errors = form.formState.errors;
  const submit = form.handleSubmit((values) =>
    override.mutate(values, {
      onSuccess: () => onSigned(values.severity),
      onError: () => {
        form.setValue('password', '');
        form.setFocus('password');
      },
    }),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Override severity" className="space-y-3 rounded border border-frame/30 bg-paper-card p-4">
      <h2>Override the severity</h2>
      <Notice tone="caution" title="What an override does">
        The supplier and part leave {SWITCHING_PHASE_LABELS[current].toLowerCase()} for the severity you choose. Lots received from now on are sampled on it;
        lots already sampled keep their plans. The counts and the switching score start again, and the switching rules go on from there.
      </Notice>
      {override.error && <Notice tone="error">{override.error.message}</Notice>}
      <fieldset className="flex flex-wrap gap-4">
        <legend className="mb-1 text-xs font-medium text-ink-muted">New severity</legend>
        {SEVERITIES.filter((s) => s !== current).map((s) => (
          <label key={s} className="inline-flex items-center gap-1.5 text-sm">
            <input type="radio" value={s} {...form.register('severity')} /> {SWITCHING_PHASE_LABELS[s]}
          </label>
        ))}
        {errors.severity && (
          <p role="alert" className="w-full text-xs text-state-fail">
            Choose a severity.
          </p>
        )}
      </fieldset>
      <Field label="Reason" htmlFor="override-reason" error={errors.reason?.message}>
        <textarea id="override-reason" rows={2} className={inputClass} {...form.register('reason')} />
      </Field>
      <SignatureFields meaning={OVERRIDE_MEANING} register={form.register} errors={errors} idPrefix="override" />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" disabled={override.isPending}>
          {override.isPending ? 'Signing…' : 'Sign the override'}
        </Button>
        <Button look="quiet" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
