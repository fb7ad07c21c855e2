import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { supplierInputSchema, type SupplierView } from '@shared/schemas/purchasing';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useSaveSupplier } from '../api';

export function SupplierForm({ supplier, onDone }: { supplier?: SupplierView; onDone: () => void }) {
  const save = useSaveSupplier();
  const form = useForm({
    resolver: zodResolver(supplierInputSchema),
    defaultValues: supplier
      ? {
          name: supplier.name,
          contactEmail: supplier.contactEmail,
          qualityContactEmail: supplier.qualityContactEmail ?? '',
          notes: supplier.notes,
          active: supplier.active,
        }
      : { name: '', contactEmail: '', qualityContactEmail: '', notes: '', active: true },
  });
  const errors = form.formState.errors;
  const submit = form.handleSubmit((input) =>
    save.mutate({ id: supplier?.id, input }, { onSuccess: onDone, onError: (error) => showServerFieldErrors(error, form.setError) }),
  );
  const prefix = `supplier-${supplier?.id ?? 'new'}`;
  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={supplier ? `Edit ${supplier.name}` : 'New supplier'}
      className="mb-4 space-y-3 rounded border border-paper-line bg-paper-card p-4"
    >
      {save.error && <Notice tone="error">{save.error.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Field label="Name" htmlFor={`${prefix}-name`} error={errors.name?.message}>
          <input id={`${prefix}-name`} className={inputClass} {...form.register('name')} />
        </Field>
        <Field label="Contact e-mail" htmlFor={`${prefix}-email`} error={errors.contactEmail?.message} hint="Where rejection notices and orders go.">
          <input id={`${prefix}-email`} type="email" className={inputClass} {...form.register('contactEmail')} />
        </Field>
        <Field
          label="Quality contact e-mail"
          htmlFor={`${prefix}-quality-email`}
          error={errors.qualityContactEmail?.message}
          hint="Where corrective-action requests go."
        >
          <input id={`${prefix}-quality-email`} type="email" className={inputClass} {...form.register('qualityContactEmail')} />
        </Field>
        <Field label="Owner" hint="The buyer who saves a new supplier owns it.">
          <p className="py-1.5 text-sm">{supplier?.owner?.name ?? 'You'}</p>
        </Field>
      </div>
      <Field label="Notes" htmlFor={`${prefix}-notes`} error={errors.notes?.message}>
        <textarea id={`${prefix}-notes`} rows={2} className={inputClass} {...form.register('notes')} />
      </Field>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" {...form.register('active')} /> Active (new orders may be placed)
      </label>
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending}>
          {supplier ? 'Save supplier' : 'Create supplier'}
        </Button>
        <Button look="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
