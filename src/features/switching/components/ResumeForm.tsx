// Resuming acceptance inspection after discontinuation (ISO 2859-1, 9.4): the supplier's corrective
// action is recorded with its reference, the quality manager signs, and inspection resumes on
// tightened; lots that waited in quarantine get their plans.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { PlayCircle } from 'lucide-react';
import { RESUME_MEANING, resumeInspectionSchema, type ResumeInspectionInput } from '@shared/schemas/switching';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useAcceptedRequests, useResumeInspection } from '../api';
import { SignatureFields } from '@/components/SignatureFields';

type Props = { supplierId: number; partId: number; waitingLots: number; onResumed(plansDrawnFor: number[]): void };

export function ResumeForm({ supplierId, partId, waitingLots, onResumed }: Props) {
  const resume = useResumeInspection(supplierId, partId);
  const requests = useAcceptedRequests(supplierId, partId);
  const form = useForm<ResumeInspectionInput>({
    resolver: zodResolver(resumeInspectionSchema),
    defaultValues: { correctiveAction: '', reference: '', password: '', meaningAcknowledged: false as unknown as true },
  });
  const errors = form.formState.errors;
  const pickedRequest = form.watch('correctiveActionId');
  // The promise rather than mutate's own callbacks: once the new state is read this form is gone,
  // and callbacks of an unmounted mutation never run.
  const submit = form.handleSubmit((values) =>
    resume.mutateAsync(values).then(
      (answer) => onResumed(answer.plansDrawnFor),
      // What was typed stays; a refused password is typed again.
      () => {
        form.setValue('password', '');
        form.setFocus('password');
      },
    ),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Resume inspection" className="space-y-3 rounded border border-state-fail/40 bg-paper-card p-4">
      <h2 className="flex items-center gap-2">
        <PlayCircle className="h-4 w-4" aria-hidden /> Resume inspection
      </h2>
      <p className="text-sm text-ink-muted">
        Acceptance stays discontinued until the supplier has acted to improve what it submits. Record that action; inspection then resumes on tightened
        inspection
        {waitingLots > 0
          ? `, and ${waitingLots === 1 ? 'the lot waiting in quarantine gets its sampling plan' : `the ${waitingLots} lots waiting in quarantine get their sampling plans`}`
          : ''}
        .
      </p>
      {resume.error && <Notice tone="error">{resume.error.message}</Notice>}
      <Field label="Supplier's corrective action" htmlFor="corrective-action" error={errors.correctiveAction?.message}>
        <textarea id="corrective-action" rows={3} className={inputClass} {...form.register('correctiveAction')} />
      </Field>
      <Field
        label="Accepted corrective-action request"
        htmlFor="corrective-request"
        hint={
          requests.data?.data.length
            ? 'The request whose answer quality accepted.'
            : 'No accepted request of this part from this supplier: give the reference of the action below.'
        }
      >
        <select
          id="corrective-request"
          className={`${inputClass} max-w-md`}
          {...form.register('correctiveActionId', { setValueAs: (v) => (v === '' || v === undefined ? undefined : Number(v)) })}
        >
          <option value="">None: an action recorded elsewhere</option>
          {requests.data?.data.map((r) => (
            <option key={r.id} value={r.id}>
              {r.number} · NCRs {r.ncrs.join(', ')}
            </option>
          ))}
        </select>
      </Field>
      {!pickedRequest && (
        <Field
          label="Reference of the corrective action"
          htmlFor="corrective-reference"
          hint="For actions recorded before corrective-action requests were kept here: the supplier's report number."
          error={errors.reference?.message}
        >
          <input id="corrective-reference" className={`${inputClass} max-w-xs font-mono`} {...form.register('reference')} />
        </Field>
      )}
      <SignatureFields meaning={RESUME_MEANING} register={form.register} errors={errors} idPrefix="resume" />
      <Button type="submit" disabled={resume.isPending}>
        {resume.isPending ? 'Signing…' : 'Sign: resume on tightened inspection'}
      </Button>
    </form>
  );
}
