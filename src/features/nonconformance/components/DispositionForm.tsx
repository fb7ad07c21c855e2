// The quality manager's signed disposition of the chosen pieces (or of every piece still awaiting
// one): return to vendor, scrap, rework, or use as is under a current deviation of the register.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Gavel } from 'lucide-react';
import {
  NCR_DECISIONS,
  NCR_DECISION_LABELS,
  NCR_SIGNATURE_MEANINGS,
  ncrDispositionSchema,
  type NcrDispositionInput,
  type NcrView,
} from '@shared/schemas/nonconformance';
import { pieceAwaitsDisposition } from '@shared/nonconformance/progress';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { SignatureFields } from '@/components/SignatureFields';
import { counted } from '@/lib/plural';
import { useCurrentDeviations, useSignNcrDisposition, useStockBins } from '../api';

const WHAT_HAPPENS = {
  'return-to-vendor': 'The pieces wait in the return-to-vendor cage until they are shipped back on a return.',
  scrap: 'The pieces leave stores for good.',
  rework: 'The pieces go to the hold rack for rework; they return to stock only by a signed release after re-inspection.',
  'use-as-is': 'The pieces go to the stock bin chosen, released under the deviation, which they take quantity from.',
} as const;

type Props = { ncr: NcrView; selected: number[]; onSigned(summary: string): void };

export function DispositionForm({ ncr, selected, onSigned }: Props) {
  const sign = useSignNcrDisposition(ncr.id);
  const form = useForm<NcrDispositionInput>({
    resolver: zodResolver(ncrDispositionSchema),
    defaultValues: { decision: 'return-to-vendor', pieceIds: [], justification: '', note: '', password: '', meaningAcknowledged: false as unknown as true },
  });
  const decision = form.watch('decision');
  const deviations = useCurrentDeviations(ncr.supplier.id, ncr.part.id, decision === 'use-as-is');
  const bins = useStockBins();
  const errors = form.formState.errors;
  const progress = (p: NcrView['pieces'][number]) => ({
    serial: p.serial,
    decision: p.disposition?.decision ?? null,
    reworkReleased: p.reworkReleased,
    shipped: p.returnId !== null,
  });
  const chosen = selected.length ? ncr.pieces.filter((p) => selected.includes(p.pieceId)) : ncr.pieces.filter((p) => pieceAwaitsDisposition(progress(p)));
  const submit = form.handleSubmit((values) =>
    sign.mutate(
      { ...values, pieceIds: selected },
      {
        onSuccess: () => onSigned(`${NCR_DECISION_LABELS[values.decision]}: ${counted(chosen.length, 'piece')} signed.`),
        onError: () => {
          form.setValue('password', '');
          form.setFocus('password');
        },
      },
    ),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Sign a disposition" className="space-y-3 rounded border border-paper-line bg-paper-card p-4">
      <h2 className="flex items-center gap-2">
        <Gavel className="h-4 w-4" aria-hidden /> Sign a disposition
      </h2>
      <p className="text-sm text-ink-muted">
        Covers {selected.length ? `the ${counted(selected.length, 'piece')} ticked` : `every piece still awaiting a disposition (${chosen.length})`}
        {chosen.length > 0 && chosen.length <= 8 && <span className="font-mono text-xs">: {chosen.map((p) => p.serial).join(', ')}</span>}.
      </p>
      {sign.error && <Notice tone="error">{sign.error.message}</Notice>}
      <fieldset className="flex flex-wrap gap-x-4 gap-y-1">
        <legend className="mb-1 text-xs font-medium text-ink-muted">Disposition</legend>
        {NCR_DECISIONS.map((d) => (
          <label key={d} className="flex items-center gap-1.5 text-sm">
            <input type="radio" value={d} {...form.register('decision')} /> {NCR_DECISION_LABELS[d]}
          </label>
        ))}
      </fieldset>
      <p className="text-xs text-ink-muted">{WHAT_HAPPENS[decision]}</p>
      {decision === 'use-as-is' && (
        <div className="grid gap-3 sm:grid-cols-2">
          <Field
            label="Deviation"
            htmlFor="ncr-deviation"
            error={errors.deviationId?.message}
            hint={deviations.data && deviations.data.data.length === 0 ? 'No current deviation covers this supplier and part.' : undefined}
          >
            <select id="ncr-deviation" className={inputClass} {...form.register('deviationId')}>
              <option value="">Choose…</option>
              {deviations.data?.data.map((d) => (
                <option key={d.id} value={d.id}>
                  {d.number} · {d.quantityLeft} left, until {d.expiresOn}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Stock bin" htmlFor="ncr-bin" error={errors.toLocationId?.message}>
            <select id="ncr-bin" className={inputClass} {...form.register('toLocationId')}>
              <option value="">Choose…</option>
              {bins.data?.map((b) => (
                <option key={b.id} value={b.id}>
                  {b.code} · {b.name}
                </option>
              ))}
            </select>
          </Field>
          <div className="sm:col-span-2">
            <Field label="Justification" htmlFor="ncr-justification" error={errors.justification?.message}>
              <textarea id="ncr-justification" rows={2} className={inputClass} {...form.register('justification')} />
            </Field>
          </div>
        </div>
      )}
      <Field label="Note (optional)" htmlFor="ncr-note" error={errors.note?.message}>
        <input id="ncr-note" className={inputClass} {...form.register('note')} />
      </Field>
      <SignatureFields meaning={NCR_SIGNATURE_MEANINGS[decision]} register={form.register} errors={errors} idPrefix="ncr-disposition" />
      <Button type="submit" disabled={sign.isPending || chosen.length === 0}>
        {sign.isPending ? 'Signing…' : `Sign: ${NCR_DECISION_LABELS[decision].toLowerCase()}`}
      </Button>
    </form>
  );
}
