import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { zodResolver } from '@hookform/resolvers/zod';
import { exportFilterSchema, type ExportFilter } from '@shared/schemas/exports';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { usePartOptions, useStartExport, useSupplierOptions } from '../api';

const isoDate = (date: Date) => `${date.getFullYear()}-${String(date.getMonth() + 1).padStart(2, '0')}-${String(date.getDate()).padStart(2, '0')}`;

/** First and last day of the month `offset` months from this one, in local time. */
function month(offset: number) {
  const now = new Date();
  return { from: isoDate(new Date(now.getFullYear(), now.getMonth() + offset, 1)), to: isoDate(new Date(now.getFullYear(), now.getMonth() + offset + 1, 0)) };
}

const optionalId = { setValueAs: (value: string) => (value === '' ? undefined : Number(value)) };

export function ExportForm() {
  const suppliers = useSupplierOptions();
  const parts = usePartOptions();
  const start = useStartExport();
  const form = useForm<z.input<typeof exportFilterSchema>, unknown, ExportFilter>({ resolver: zodResolver(exportFilterSchema), defaultValues: month(-1) });
  const errors = form.formState.errors;
  const pick = (range: { from: string; to: string }) => {
    form.setValue('from', range.from);
    form.setValue('to', range.to);
  };
  const submit = form.handleSubmit((filter: ExportFilter) => start.mutate(filter));

  return (
    <form aria-label="New export" onSubmit={submit} noValidate className="space-y-3 rounded border border-paper-line bg-paper-card px-4 py-3">
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Issued from" htmlFor="export-from" error={errors.from?.message}>
          <input id="export-from" type="date" className={inputClass} {...form.register('from')} />
        </Field>
        <Field label="Issued to" htmlFor="export-to" error={errors.to?.message}>
          <input id="export-to" type="date" className={inputClass} {...form.register('to')} />
        </Field>
        <div className="flex gap-1 pb-0.5">
          <Button look="secondary" onClick={() => pick(month(0))}>
            This month
          </Button>
          <Button look="secondary" onClick={() => pick(month(-1))}>
            Last month
          </Button>
        </div>
      </div>
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Supplier" htmlFor="export-supplier" error={suppliers.error ? `Suppliers could not be loaded: ${suppliers.error.message}` : undefined}>
          <select id="export-supplier" className={`${inputClass} w-64`} disabled={!suppliers.data} {...form.register('supplierId', optionalId)}>
            <option value="">All suppliers</option>
            {suppliers.data?.data.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Part" htmlFor="export-part" error={parts.error ? `Parts could not be loaded: ${parts.error.message}` : undefined}>
          <select id="export-part" className={`${inputClass} w-72`} disabled={!parts.data} {...form.register('partId', optionalId)}>
            <option value="">All parts</option>
            {parts.data?.data.map((p) => (
              <option key={p.id} value={p.id}>
                {p.number} — {p.description}
              </option>
            ))}
          </select>
        </Field>
        <Button type="submit" disabled={start.isPending}>
          {start.isPending ? 'Starting…' : 'Start export'}
        </Button>
      </div>
      {start.error && <Notice tone="error">{start.error.message}</Notice>}
    </form>
  );
}
