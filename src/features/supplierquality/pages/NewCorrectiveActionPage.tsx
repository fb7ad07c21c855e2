// Raising a corrective-action request from one or several NCRs of one supplier's part. Coming from
// an NCR (`?ncr=ID`) narrows the choice to that NCR's supplier and part.
import { useMemo } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { carRaiseSchema, type CarRaiseInput } from '@shared/schemas/correctiveActions';
import { lotName } from '@shared/schemas/stock';
import { Button } from '@/components/Button';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useNcrChoices, useRaiseCorrectiveAction, type NcrChoice } from '../api';
import { plural } from '@shared/format';

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

export function NewCorrectiveActionPage() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const from = Number(params.get('ncr')) || null;
  const raise = useRaiseCorrectiveAction();
  const all = useNcrChoices({});
  const origin = all.data?.data.find((n) => n.id === from);
  const form = useForm<CarRaiseInput>({
    resolver: zodResolver(carRaiseSchema),
    defaultValues: { nonconformanceIds: from ? [from] : [], problem: '', responseDueOn: inDays(30) },
  });
  const chosen = (form.watch('nonconformanceIds') ?? []).map(Number);
  const first = all.data?.data.find((n) => n.id === chosen[0]) ?? origin;
  // Once one NCR is chosen, only NCRs of the same supplier and part can join it.
  const choices = useMemo(
    () => (all.data?.data ?? []).filter((n: NcrChoice) => !first || (n.supplierId === first.supplierId && n.partId === first.partId)),
    [all.data, first],
  );
  const errors = form.formState.errors;
  const submit = form.handleSubmit((input) =>
    raise.mutate(
      { ...input, nonconformanceIds: input.nonconformanceIds.map(Number) },
      { onSuccess: (created) => navigate(`/corrective-actions/${created.id}`), onError: (error) => showServerFieldErrors(error, form.setError) },
    ),
  );
  return (
    <div className="max-w-4xl space-y-3">
      <PageHeader title="New corrective-action request" subtitle={<Link to="/corrective-actions">Corrective actions</Link>} />
      <form onSubmit={submit} noValidate aria-label="New corrective-action request" className="space-y-3 rounded border border-paper-line bg-paper-card p-4">
        {raise.error && <Notice tone="error">{raise.error.message}</Notice>}
        <fieldset>
          <legend className="mb-1 text-xs font-medium text-ink-muted">NCRs it answers{first && ` (${first.supplierName}, ${first.partNumber})`}</legend>
          {all.isPending && <p className="text-sm text-ink-muted">Reading the NCRs…</p>}
          {all.data && choices.length === 0 && <p className="text-sm text-ink-faint">No NCR to raise a request from.</p>}
          <ul className="max-h-72 space-y-1 overflow-y-auto rounded border border-paper-line p-2">
            {choices.map((n) => (
              <li key={n.id}>
                <label className="flex flex-wrap items-baseline gap-x-2 text-sm">
                  <input
                    type="checkbox"
                    checked={chosen.includes(n.id)}
                    onChange={(e) =>
                      form.setValue('nonconformanceIds', e.target.checked ? [...chosen, n.id] : chosen.filter((id) => id !== n.id), {
                        shouldValidate: form.formState.isSubmitted,
                      })
                    }
                  />
                  <span className="font-mono font-medium">{n.number}</span>
                  <span>
                    {n.supplierName} · {n.partNumber}
                    {n.lotId ? ` · ${lotName(n.lotId)}` : ''}
                  </span>
                  <span className="text-xs text-ink-muted">{[`${plural(n.pieces, 'piece')}`, ...n.defects].join('; ')}</span>
                </label>
              </li>
            ))}
          </ul>
          {errors.nonconformanceIds && (
            <p role="alert" className="text-xs text-state-fail">
              {errors.nonconformanceIds.message ?? 'Choose at least one NCR'}
            </p>
          )}
        </fieldset>
        <Field
          label="What the supplier is asked to correct"
          htmlFor="car-problem"
          hint="The supplier reads this in the mail and on the answer form."
          error={errors.problem?.message}
        >
          <textarea id="car-problem" rows={4} className={inputClass} {...form.register('problem')} />
        </Field>
        <Field label="Answer due" htmlFor="car-due" error={errors.responseDueOn?.message}>
          <input id="car-due" {...isoDateInput} className={`${inputClass} max-w-48`} {...form.register('responseDueOn')} />
        </Field>
        <p className="text-xs text-ink-muted">
          The request goes by mail to the supplier's quality contact with a link to answer it without an account. The link is valid for 30 days and takes one
          answer; overdue requests are reminded weekly.
        </p>
        <div className="flex gap-2">
          <Button type="submit" disabled={raise.isPending}>
            {raise.isPending ? 'Sending…' : 'Send the request'}
          </Button>
          <Button look="secondary" onClick={() => navigate('/corrective-actions')}>
            Cancel
          </Button>
        </div>
      </form>
    </div>
  );
}
