import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { PenLine } from 'lucide-react';
import { DISPOSITIONS, DISPOSITION_LABELS, SIGNATURE_MEANINGS, dispositionInputSchema, type DispositionInput } from '@shared/inspection/lotVerdict';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useSignDisposition } from '../api';
import type { LotInspectionView } from '../api/types';

export function DispositionPanel({ view }: { view: LotInspectionView }) {
  const sign = useSignDisposition(view.lot.id);
  const proposal = view.verdict.proposal;
  const suggested = proposal === 'reject' ? 'reject' : 'accept';
  const form = useForm<DispositionInput>({
    resolver: zodResolver(dispositionInputSchema),
    defaultValues: { decision: suggested, password: '', meaningAcknowledged: false as unknown as true, expectedDispositionId: view.disposition?.id ?? null },
  });
  const decision = form.watch('decision');
  const errors = form.formState.errors;
  const submit = form.handleSubmit((values) => sign.mutate({ ...values, expectedDispositionId: view.disposition?.id ?? null }, { onSuccess: () => form.reset({ ...values, password: '' }) }));

  if (proposal === 'undecided') {
    return <Notice tone="info" title="Not ready for a decision">{view.verdict.explanation}. Every sample piece needs a complete result first.</Notice>;
  }
  return (
    <form onSubmit={submit} noValidate aria-label="Sign disposition" className="space-y-3 rounded border border-frame/30 bg-paper-card p-4">
      <h2 className="flex items-center gap-2"><PenLine className="h-4 w-4" aria-hidden /> {view.disposition ? 'Supersede the decision' : 'Sign the disposition'}</h2>
      {sign.error && <Notice tone="error">{sign.error.message}</Notice>}
      {sign.isSuccess && <Notice tone="info">Signed. Documents issued: {sign.data.documents.map((d) => d.number).join(', ')}.</Notice>}
      <fieldset className="flex flex-wrap gap-4">
        <legend className="mb-1 text-xs font-medium text-ink-muted">Decision (the sample proposes: {proposal})</legend>
        {DISPOSITIONS.map((d) => (
          <label key={d} className="inline-flex items-center gap-1.5 text-sm">
            <input type="radio" value={d} {...form.register('decision')} /> {DISPOSITION_LABELS[d]}
          </label>
        ))}
      </fieldset>
      {decision === 'use-as-is' && (
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label="Deviation number" htmlFor="deviation" error={errors.deviationNumber?.message}>
            <input id="deviation" className={inputClass} {...form.register('deviationNumber')} />
          </Field>
        </div>
      )}
      <Field label={decision === 'use-as-is' ? 'Justification' : 'Note (optional)'} htmlFor="justification" error={errors.justification?.message}>
        <textarea id="justification" rows={2} className={inputClass} {...form.register('justification')} />
      </Field>
      <div className="rounded border border-paper-line bg-paper px-3 py-2 text-sm">
        <p className="text-xs font-medium text-ink-muted">Meaning of your signature</p>
        <p>{SIGNATURE_MEANINGS[decision]}</p>
        <label className="mt-2 flex items-center gap-2 text-sm">
          <input type="checkbox" {...form.register('meaningAcknowledged')} /> I have read the meaning of this signature and sign accordingly.
        </label>
        {errors.meaningAcknowledged && <p className="text-xs text-state-fail">{errors.meaningAcknowledged.message}</p>}
      </div>
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Your password (re-entered to sign)" htmlFor="sign-password" error={errors.password?.message}>
          <input id="sign-password" type="password" autoComplete="current-password" className={inputClass} {...form.register('password')} />
        </Field>
        <Button type="submit" look={decision === 'reject' ? 'danger' : 'primary'} disabled={sign.isPending}>
          {sign.isPending ? 'Signing…' : `Sign: ${DISPOSITION_LABELS[decision]}`}
        </Button>
      </div>
      <p className="text-xs text-ink-muted">The decision remains the responsibility of the site's quality system and its procedures. A signed decision is never edited; a new signature supersedes it and revokes its documents.</p>
    </form>
  );
}
