// A purchase order and its lines. Each line copies the part's specification when the PO is saved;
// lines that have received pieces keep their part, and their quantity cannot fall below what came.
import { Fragment } from 'react';
import { useFieldArray, useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Plus, Trash2 } from 'lucide-react';
import {
  AQL_VALUES,
  INSPECTION_LEVELS,
  purchaseOrderInputSchema,
  type PartView,
  type PurchaseOrderInput,
  type PurchaseOrderView,
  type SupplierView,
} from '@shared/schemas/purchasing';
import { Button } from '@/components/Button';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useParts, useSavePurchaseOrder, useSuppliers } from '../api';
import { LinePlan } from './LinePlan';

const ALL = { page: 1, pageSize: 500 };
const newLine = { partId: '', quantity: '', unitPrice: '', inspectionLevel: 'II', aql: 1, hundredPercent: false, dueOn: '' } as const;

function valuesOf(order?: PurchaseOrderView): PurchaseOrderInput {
  if (!order)
    return {
      number: '',
      supplierId: '',
      orderedOn: new Date().toISOString().slice(0, 10),
      currency: 'EUR',
      status: 'open',
      notes: '',
      lines: [{ ...newLine }],
    };
  return {
    number: order.number,
    supplierId: order.supplier.id,
    orderedOn: order.orderedOn,
    currency: order.currency,
    status: order.status,
    notes: order.notes,
    lines: order.lines.map((l) => ({
      id: l.id,
      partId: l.part.id,
      quantity: l.quantity,
      unitPrice: l.unitPrice,
      inspectionLevel: l.inspectionLevel,
      aql: l.aql,
      hundredPercent: l.hundredPercent,
      dueOn: l.dueOn ?? '',
    })),
  };
}

type Props = { order?: PurchaseOrderView; onSaved: (order: PurchaseOrderView) => void; onCancel: () => void };

/** The choices come first: a select only shows its saved value once its options are there. */
export function PurchaseOrderForm(props: Props) {
  const suppliers = useSuppliers({ ...ALL, sort: 'name', active: props.order ? undefined : 'true' });
  const parts = useParts({ ...ALL, sort: 'number' });
  if (suppliers.error || parts.error) return <Notice tone="error">{(suppliers.error ?? parts.error)!.message}</Notice>;
  if (!suppliers.data || !parts.data) return <p className="text-ink-muted">Loading suppliers and parts…</p>;
  return <OrderFields {...props} suppliers={suppliers.data.data} parts={parts.data.data} />;
}

function OrderFields({ order, onSaved, onCancel, suppliers, parts }: Props & { suppliers: SupplierView[]; parts: PartView[] }) {
  const save = useSavePurchaseOrder();
  const form = useForm({ resolver: zodResolver(purchaseOrderInputSchema), defaultValues: valuesOf(order) });
  const lines = useFieldArray({ control: form.control, name: 'lines' });
  const watchedLines = useWatch({ control: form.control, name: 'lines' });
  const errors = form.formState.errors;
  const received = new Map(order?.lines.map((l) => [l.id, l.received]) ?? []);
  const submit = form.handleSubmit((input) =>
    save.mutate({ id: order?.id, input }, { onSuccess: onSaved, onError: (error) => showServerFieldErrors(error, form.setError) }),
  );
  const lineError = (index: number, field: 'partId' | 'quantity' | 'unitPrice' | 'aql' | 'dueOn') => errors.lines?.[index]?.[field]?.message;

  return (
    <form onSubmit={submit} noValidate aria-label={order ? `Edit ${order.number}` : 'New purchase order'} className="space-y-4">
      {save.error && <Notice tone="error">{save.error.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-5">
        <Field label="PO number" htmlFor="po-number" error={errors.number?.message}>
          <input id="po-number" className={`${inputClass} font-mono`} {...form.register('number')} />
        </Field>
        <div className="sm:col-span-2">
          <Field label="Supplier" htmlFor="po-supplier" error={errors.supplierId?.message}>
            <select id="po-supplier" className={inputClass} {...form.register('supplierId')}>
              <option value="">Choose a supplier…</option>
              {suppliers.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
          </Field>
        </div>
        <Field label="Ordered on" htmlFor="po-date" error={errors.orderedOn?.message}>
          <input id="po-date" {...isoDateInput} className={inputClass} {...form.register('orderedOn')} />
        </Field>
        <Field label="Currency" htmlFor="po-currency" error={errors.currency?.message}>
          <input id="po-currency" maxLength={3} className={`${inputClass} uppercase`} {...form.register('currency')} />
        </Field>
      </div>

      <fieldset className="rounded border border-paper-line">
        <legend className="ml-2 px-1 text-xs font-semibold text-ink-muted">Lines</legend>
        {errors.lines?.message && (
          <p role="alert" className="px-3 text-xs text-state-fail">
            {errors.lines.message}
          </p>
        )}
        {errors.lines?.root?.message && (
          <p role="alert" className="px-3 text-xs text-state-fail">
            {errors.lines.root.message}
          </p>
        )}
        {/* The lines' fields reach the keyboard themselves, so the box needs no focus of its own; relative: what is positioned inside (hidden labels) scrolls with it instead of widening the page. */}
        <div className="relative overflow-x-auto">
          <table className="w-full text-sm">
            <thead className="text-left text-xs text-ink-muted">
              <tr>
                <th className="px-2 py-1 font-medium">#</th>
                <th className="px-2 py-1 font-medium">Part</th>
                <th className="px-2 py-1 font-medium">Quantity</th>
                <th className="px-2 py-1 font-medium">Unit price</th>
                <th className="px-2 py-1 font-medium">Due</th>
                <th className="px-2 py-1 font-medium">Inspection level</th>
                <th className="px-2 py-1 font-medium">AQL</th>
                <th className="px-2 py-1 font-medium">100 %</th>
                <th className="px-2 py-1">
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {lines.fields.map((field, index) => {
                const lineId = form.getValues(`lines.${index}.id`) as number | undefined;
                const got = lineId ? (received.get(lineId) ?? 0) : 0;
                const watched = watchedLines[index] ?? field;
                return (
                  <Fragment key={field.id}>
                    <tr className="border-t border-paper-line/70 align-top" aria-label={`Line ${index + 1}`}>
                      <td className="px-2 py-1.5 text-ink-muted">{index + 1}</td>
                      <td className="px-2 py-1">
                        {got > 0 ? (
                          <>
                            <input type="hidden" {...form.register(`lines.${index}.partId`)} />
                            <p className="py-1.5 font-mono">{order?.lines.find((l) => l.id === lineId)?.part.number}</p>
                            <p className="text-2xs text-ink-faint">{got} received; the part is fixed</p>
                          </>
                        ) : (
                          <select aria-label={`Part of line ${index + 1}`} className={`${inputClass} w-full`} {...form.register(`lines.${index}.partId`)}>
                            <option value="">Choose a part…</option>
                            {parts
                              .filter((p) => p.active || p.id === Number(field.partId))
                              .map((p) => (
                                <option key={p.id} value={p.id}>
                                  {p.number} — {p.description}
                                </option>
                              ))}
                          </select>
                        )}
                        {lineError(index, 'partId') && (
                          <p role="alert" className="text-xs text-state-fail">
                            {lineError(index, 'partId')}
                          </p>
                        )}
                      </td>
                      <td className="px-2 py-1">
                        <input
                          aria-label={`Quantity of line ${index + 1}`}
                          inputMode="numeric"
                          className={`${inputClass} w-24`}
                          {...form.register(`lines.${index}.quantity`)}
                        />
                        {lineError(index, 'quantity') && (
                          <p role="alert" className="text-xs text-state-fail">
                            {lineError(index, 'quantity')}
                          </p>
                        )}
                      </td>
                      <td className="px-2 py-1">
                        <input
                          aria-label={`Unit price of line ${index + 1}`}
                          inputMode="decimal"
                          className={`${inputClass} w-24`}
                          {...form.register(`lines.${index}.unitPrice`)}
                        />
                        {lineError(index, 'unitPrice') && (
                          <p role="alert" className="text-xs text-state-fail">
                            {lineError(index, 'unitPrice')}
                          </p>
                        )}
                      </td>
                      <td className="px-2 py-1">
                        <input
                          {...isoDateInput}
                          aria-label={`Due date of line ${index + 1}`}
                          className={`${inputClass} w-36`}
                          {...form.register(`lines.${index}.dueOn`)}
                        />
                        {lineError(index, 'dueOn') && (
                          <p role="alert" className="text-xs text-state-fail">
                            {lineError(index, 'dueOn')}
                          </p>
                        )}
                      </td>
                      <td className="px-2 py-1">
                        <select
                          aria-label={`Inspection level of line ${index + 1}`}
                          className={inputClass}
                          {...form.register(`lines.${index}.inspectionLevel`)}
                        >
                          {INSPECTION_LEVELS.map((level) => (
                            <option key={level} value={level}>
                              {level}
                            </option>
                          ))}
                        </select>
                      </td>
                      <td className="px-2 py-1">
                        <select aria-label={`AQL of line ${index + 1}`} className={inputClass} {...form.register(`lines.${index}.aql`)}>
                          {AQL_VALUES.map((aql) => (
                            <option key={aql} value={aql}>
                              {aql}
                            </option>
                          ))}
                        </select>
                      </td>
                      <td className="px-2 py-2 text-center">
                        <input type="checkbox" aria-label={`100 % inspection of line ${index + 1}`} {...form.register(`lines.${index}.hundredPercent`)} />
                      </td>
                      <td className="px-2 py-1">
                        <Button
                          look="quiet"
                          aria-label={`Remove line ${index + 1}`}
                          disabled={got > 0 || lines.fields.length === 1}
                          onClick={() => lines.remove(index)}
                        >
                          <Trash2 className="h-4 w-4" aria-hidden />
                        </Button>
                      </td>
                    </tr>
                    <tr aria-label={`Sampling plan of line ${index + 1}`}>
                      <td />
                      <td colSpan={8} className="px-2 pb-1.5 text-xs text-ink-muted">
                        <LinePlan quantity={watched.quantity} level={watched.inspectionLevel} aql={watched.aql} hundredPercent={watched.hundredPercent} />
                      </td>
                    </tr>
                  </Fragment>
                );
              })}
            </tbody>
          </table>
        </div>
        <div className="border-t border-paper-line px-2 py-1.5">
          <Button look="quiet" onClick={() => lines.append({ ...newLine })}>
            <Plus className="h-4 w-4" aria-hidden /> Add line
          </Button>
        </div>
      </fieldset>

      <div className="grid gap-3 sm:grid-cols-3">
        <div className="sm:col-span-2">
          <Field label="Notes" htmlFor="po-notes" error={errors.notes?.message}>
            <textarea id="po-notes" rows={2} className={inputClass} {...form.register('notes')} />
          </Field>
        </div>
        <Field label="Status" htmlFor="po-status" hint="A closed PO accepts no more shipments.">
          <select id="po-status" className={inputClass} {...form.register('status')}>
            <option value="open">Open</option>
            <option value="closed">Closed</option>
          </select>
        </Field>
      </div>
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending}>
          {order ? 'Save purchase order' : 'Place purchase order'}
        </Button>
        <Button look="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
