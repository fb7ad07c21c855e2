// Writing a deviation of the register (or correcting one no one has approved yet): supplier, part,
// what it allows, optional widened tolerances, how many pieces and until when.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { deviationInputSchema, type DeviationInput, type DeviationView } from '@shared/schemas/deviations';
import { Button } from '@/components/Button';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useOptions, useSaveDeviation, type Option } from '../api';

type Props = { deviation?: DeviationView; preset?: { supplierId?: number; partId?: number }; onSaved(saved: DeviationView): void; onCancel(): void };

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

export function DeviationForm(props: Props) {
  const suppliers = useOptions('suppliers');
  const parts = useOptions('parts');
  const failed = suppliers.error ?? parts.error;
  if (failed) return <Notice tone="error">{failed.message}</Notice>;
  // The selects show the chosen supplier and part only once their options exist.
  if (!suppliers.data || !parts.data) return <p className="text-sm text-ink-muted">Loading suppliers and parts…</p>;
  return <LoadedForm {...props} suppliers={suppliers.data.data} parts={parts.data.data} />;
}

function LoadedForm({ deviation, preset, onSaved, onCancel, suppliers, parts }: Props & { suppliers: Option[]; parts: Option[] }) {
  const save = useSaveDeviation(deviation?.id);
  const form = useForm<DeviationInput>({
    resolver: zodResolver(deviationInputSchema),
    defaultValues: deviation
      ? {
          supplierId: deviation.supplier.id,
          partId: deviation.part.id,
          allowed: deviation.allowed,
          retardanceTolWaves: deviation.retardanceTolWaves ?? '',
          axisTolDeg: deviation.axisTolDeg ?? '',
          quantityLimit: deviation.quantityLimit ?? undefined,
          expiresOn: deviation.expiresOn ?? '',
        }
      : {
          supplierId: preset?.supplierId ?? '',
          partId: preset?.partId ?? '',
          allowed: '',
          retardanceTolWaves: '',
          axisTolDeg: '',
          quantityLimit: undefined,
          expiresOn: inDays(30),
        },
  });
  const errors = form.formState.errors;
  const submit = form.handleSubmit((input) => save.mutate(input, { onSuccess: onSaved, onError: (error) => showServerFieldErrors(error, form.setError) }));
  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={deviation ? `Edit ${deviation.number}` : 'New deviation'}
      className="mb-4 space-y-3 rounded border border-paper-line bg-paper-card p-4"
    >
      <h2>{deviation ? `Correct ${deviation.number}` : 'New deviation'}</h2>
      {save.error && <Notice tone="error">{save.error.message}</Notice>}
      <div className="grid gap-3 *:min-w-0 sm:grid-cols-2">
        <Field label="Supplier" htmlFor="deviation-supplier" error={errors.supplierId?.message}>
          <select id="deviation-supplier" className={inputClass} {...form.register('supplierId')}>
            <option value="">Choose…</option>
            {suppliers.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Part" htmlFor="deviation-part" error={errors.partId?.message}>
          <select id="deviation-part" className={inputClass} {...form.register('partId')}>
            <option value="">Choose…</option>
            {parts.map((p) => (
              <option key={p.id} value={p.id}>
                {p.number} · {p.description}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <Field
        label="What it allows"
        htmlFor="deviation-allowed"
        hint="The departure from the ordered specification, and where such pieces may be used."
        error={errors.allowed?.message}
      >
        <textarea id="deviation-allowed" rows={3} className={inputClass} {...form.register('allowed')} />
      </Field>
      <div className="grid gap-3 *:min-w-0 sm:grid-cols-4">
        <Field
          label="Retardance tolerance (± waves)"
          htmlFor="deviation-retardance"
          hint="Optional: the widened tolerance."
          error={errors.retardanceTolWaves?.message}
        >
          <input id="deviation-retardance" inputMode="decimal" className={`${inputClass} font-mono`} {...form.register('retardanceTolWaves')} />
        </Field>
        <Field label="Fast-axis tolerance (± degrees)" htmlFor="deviation-axis" hint="Optional." error={errors.axisTolDeg?.message}>
          <input id="deviation-axis" inputMode="decimal" className={`${inputClass} font-mono`} {...form.register('axisTolDeg')} />
        </Field>
        <Field label="Pieces it may cover" htmlFor="deviation-quantity" error={errors.quantityLimit?.message}>
          <input id="deviation-quantity" inputMode="numeric" className={`${inputClass} font-mono`} {...form.register('quantityLimit')} />
        </Field>
        <Field label="Last day of use" htmlFor="deviation-expires" hint="Inclusive (UTC)." error={errors.expiresOn?.message}>
          <input id="deviation-expires" {...isoDateInput} className={inputClass} {...form.register('expiresOn')} />
        </Field>
      </div>
      <p className="text-xs text-ink-muted">
        A deviation can be used once a quality manager and then a second person (quality manager or administrator) have approved it. What they approve can no
        longer be changed.
      </p>
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending}>
          {deviation ? 'Save' : 'Write to the register'}
        </Button>
        <Button look="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
