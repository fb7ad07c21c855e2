import { useEffect } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { zodResolver } from '@hookform/resolvers/zod';
import { exportFilterSchema, type ExportFilter, type ExportSpanView } from '@shared/schemas/exports';
import { Button } from '@/components/Button';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { formatDate, plural } from '@shared/format';
import { useExportSpan, usePartOptions, useStartExport, useSupplierOptions } from '../api';

/** First and last day of the month `offset` months from this one, as UTC days like the documents' issue. */
function month(offset: number) {
  const now = new Date();
  const day = (monthIndex: number, date: number) => formatDate(new Date(Date.UTC(now.getUTCFullYear(), monthIndex, date)));
  return { from: day(now.getUTCMonth() + offset, 1), to: day(now.getUTCMonth() + offset + 1, 0) };
}

const optionalId = { setValueAs: (value: string) => (value === '' ? undefined : Number(value)) };

const isDay = (value: unknown): value is string => typeof value === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(value);
const idOf = (value: unknown) => (typeof value === 'number' && value > 0 ? value : undefined);

/** What the chosen days, supplier and part find, said before the export is started. */
function DocumentCount({ range, span }: { range: { from: string; to: string }; span: ExportSpanView }) {
  if (span.documents > 0) {
    return (
      <p className="text-sm text-ink-muted" data-testid="export-count">
        {plural(span.documents, 'document')} issued from {span.first} to {span.last} in this range.
      </p>
    );
  }
  return (
    <Notice tone="info">
      No certificate or inspection report was issued from {range.from} to {range.to} for this choice; there is nothing to export. Choose other days, supplier or
      part.
    </Notice>
  );
}

export function ExportForm() {
  const suppliers = useSupplierOptions();
  const parts = usePartOptions();
  const start = useStartExport();
  const form = useForm<z.input<typeof exportFilterSchema>, unknown, ExportFilter>({ resolver: zodResolver(exportFilterSchema), defaultValues: month(0) });
  const errors = form.formState.errors;
  const [from, to, supplier, part] = useWatch({ control: form.control, name: ['from', 'to', 'supplierId', 'partId'] });
  // The days of every document there is: the range offered until the user picks one.
  const all = useExportSpan({});
  const { dirtyFields } = form.formState;
  const datesTouched = Boolean(dirtyFields.from || dirtyFields.to);
  useEffect(() => {
    if (datesTouched || !all.data?.first || !all.data.last) return;
    form.reset({ ...form.getValues(), from: all.data.first, to: all.data.last }, { keepDirty: true });
  }, [all.data, datesTouched, form]);
  const nothingIssued = all.data?.documents === 0;
  const range = isDay(from) && isDay(to) && from <= to ? { from, to } : null;
  const span = useExportSpan({ ...range, supplierId: idOf(supplier), partId: idOf(part) });
  const chosen = range && span.data && !span.isPlaceholderData ? span.data : null;
  const pick = (range: { from: string; to: string }) => {
    form.setValue('from', range.from, { shouldDirty: true });
    form.setValue('to', range.to, { shouldDirty: true });
  };
  const submit = form.handleSubmit((filter: ExportFilter) => start.mutate(filter));

  return (
    <form aria-label="New export" onSubmit={submit} noValidate className="space-y-3 rounded border border-paper-line bg-paper-card px-4 py-3">
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Issued from" htmlFor="export-from" error={errors.from?.message}>
          <input id="export-from" {...isoDateInput} className={inputClass} {...form.register('from')} />
        </Field>
        <Field label="Issued to" htmlFor="export-to" error={errors.to?.message}>
          <input id="export-to" {...isoDateInput} className={inputClass} {...form.register('to')} />
        </Field>
        <div className="flex gap-1 pb-0.5">
          <Button look="secondary" onClick={() => pick(month(0))}>
            This month
          </Button>
          <Button look="secondary" onClick={() => pick(month(-1))}>
            Last month
          </Button>
          {all.data?.first && all.data.last && (
            <Button look="secondary" onClick={() => pick({ from: all.data.first!, to: all.data.last! })}>
              Every document
            </Button>
          )}
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
        <Button type="submit" disabled={start.isPending || nothingIssued || chosen?.documents === 0}>
          {start.isPending ? 'Starting…' : 'Start export'}
        </Button>
      </div>
      {nothingIssued ? (
        <Notice tone="info">No certificate or inspection report has been issued yet; there is nothing to export.</Notice>
      ) : (
        range && chosen && <DocumentCount range={range} span={chosen} />
      )}
      {all.error && <Notice tone="error">The documents on record could not be counted: {all.error.message}</Notice>}
      {start.error && <Notice tone="error">{start.error.message}</Notice>}
    </form>
  );
}
