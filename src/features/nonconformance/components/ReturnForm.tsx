// Shipping pieces dispositioned for return back to the supplier under its RMA number.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Truck } from 'lucide-react';
import { REMEDIES, REMEDY_LABELS, returnInputSchema, type NcrView, type ReturnInput } from '@shared/schemas/nonconformance';
import { Button } from '@/components/Button';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { showServerFieldErrors } from '@/lib/formErrors';
import { counted } from '@/lib/plural';
import { useShipReturn } from '../api';

type Props = { ncr: NcrView; selected: number[]; onShipped(summary: string): void };

export function ReturnForm({ ncr, selected, onShipped }: Props) {
  const ship = useShipReturn();
  const form = useForm<ReturnInput>({
    resolver: zodResolver(returnInputSchema),
    defaultValues: {
      nonconformanceId: ncr.id,
      pieceIds: [],
      rmaNumber: '',
      shipDate: new Date().toISOString().slice(0, 10),
      carrier: '',
      tracking: '',
      remedy: 'replacement',
      note: '',
    },
  });
  const errors = form.formState.errors;
  const remedy = form.watch('remedy');
  const waiting = ncr.pieces.filter((p) => p.disposition?.decision === 'return-to-vendor' && p.returnId === null);
  const chosen = selected.length ? waiting.filter((p) => selected.includes(p.pieceId)) : waiting;
  const submit = form.handleSubmit((values) =>
    ship.mutate(
      { ...values, pieceIds: chosen.map((p) => p.pieceId) },
      {
        onSuccess: (shipped) => onShipped(`${counted(shipped.serials.length, 'piece')} shipped back under RMA ${shipped.rmaNumber}.`),
        onError: (error) => showServerFieldErrors(error, form.setError),
      },
    ),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Ship back to the vendor" className="space-y-3 rounded border border-paper-line bg-paper-card p-4">
      <h2 className="flex items-center gap-2">
        <Truck className="h-4 w-4" aria-hidden /> Ship back to {ncr.supplier.name}
      </h2>
      <p className="text-sm text-ink-muted">
        {chosen.length
          ? `${counted(chosen.length, 'piece')} ${selected.length ? 'ticked' : 'dispositioned for return and not yet shipped'}.`
          : 'No piece is dispositioned for return and waiting to ship.'}
      </p>
      {ship.error && !Object.keys(errors).length && <Notice tone="error">{ship.error.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="RMA number" htmlFor="rma-number" hint="As the supplier issued it." error={errors.rmaNumber?.message}>
          <input id="rma-number" className={`${inputClass} font-mono`} {...form.register('rmaNumber')} />
        </Field>
        <Field label="Ship date" htmlFor="rma-date" error={errors.shipDate?.message}>
          <input id="rma-date" {...isoDateInput} className={inputClass} {...form.register('shipDate')} />
        </Field>
        <Field label="Carrier" htmlFor="rma-carrier" error={errors.carrier?.message}>
          <input id="rma-carrier" className={inputClass} {...form.register('carrier')} />
        </Field>
        <Field label="Tracking (optional)" htmlFor="rma-tracking" error={errors.tracking?.message}>
          <input id="rma-tracking" className={`${inputClass} font-mono`} {...form.register('tracking')} />
        </Field>
        <fieldset>
          <legend className="mb-1 text-xs font-medium text-ink-muted">Expected from the supplier</legend>
          {REMEDIES.map((r) => (
            <label key={r} className="mr-3 inline-flex items-center gap-1.5 text-sm">
              <input type="radio" value={r} {...form.register('remedy')} /> {REMEDY_LABELS[r]}
            </label>
          ))}
        </fieldset>
        {remedy === 'credit' && (
          <Field label="Credit expected (optional)" htmlFor="rma-credit" error={errors.creditAmount?.message}>
            <input id="rma-credit" inputMode="decimal" className={inputClass} {...form.register('creditAmount')} />
          </Field>
        )}
      </div>
      <Field label="Note (optional)" htmlFor="rma-note" error={errors.note?.message}>
        <input id="rma-note" className={inputClass} {...form.register('note')} />
      </Field>
      <Button type="submit" disabled={ship.isPending || chosen.length === 0}>
        {ship.isPending ? 'Recording…' : 'Record the shipment'}
      </Button>
    </form>
  );
}
