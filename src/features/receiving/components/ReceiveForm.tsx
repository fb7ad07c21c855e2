// The clerk's receipt of a shipment against an open PO line: the lot lands in quarantine. The
// server checks everything again and writes nothing if anything is refused.
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { MAX_ATTACHMENT_BYTES, shipmentReceiveSchema } from '@shared/schemas/receiving';
import type { LineMessage } from '@shared/serials';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { ApiError } from '@/lib/api';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useOpenLines, useReceiveShipment, useReplacementCandidates, type Receipt } from '../api';
import { SerialPreview } from './SerialPreview';
import { SerialScanField } from './SerialScanField';
import { plural } from '@shared/format';

const DOCUMENT_TYPES = '.pdf,.png,.jpg,.jpeg,application/pdf,image/png,image/jpeg';
const tooLarge = (files: File[]) => files.filter((f) => f.size > MAX_ATTACHMENT_BYTES).map((f) => f.name);

export function ReceiveForm({ onReceived }: { onReceived: (receipt: Receipt) => void }) {
  const openLines = useOpenLines();
  const replaceable = useReplacementCandidates();
  const receive = useReceiveShipment();
  const form = useForm({
    resolver: zodResolver(shipmentReceiveSchema),
    defaultValues: {
      poLineId: '',
      packingSlipNumber: '',
      carrier: '',
      supplierLot: '',
      quantity: '',
      serials: '',
      overReceiptReason: '',
      replacementForNcrId: '',
    },
  });
  const [source, setSource] = useState<'typed' | 'file'>('typed');
  const [serialFile, setSerialFile] = useState<File | null>(null);
  const [packingSlips, setPackingSlips] = useState<File[]>([]);
  const [certificates, setCertificates] = useState<File[]>([]);
  const [receivedAt, setReceivedAt] = useState('');
  const [serialErrors, setSerialErrors] = useState<LineMessage[]>([]);

  const errors = form.formState.errors;
  const line = openLines.data?.data.find((l) => l.id === Number(form.watch('poLineId')));
  const quantity = Number(form.watch('quantity')) || 0;
  // NCRs of the line's supplier and part still owed replacement pieces; those may come beyond what the line expects.
  const candidates = line ? (replaceable.data?.data ?? []).filter((n) => n.supplierName === line.supplierName && n.partNumber === line.partNumber) : [];
  const replacing = candidates.find((n) => n.id === Number(form.watch('replacementForNcrId')));
  const overReceipt = line !== undefined && quantity > line.outstanding + (replacing?.replacementOwed ?? 0);
  const oversized = tooLarge([...packingSlips, ...certificates]);

  const submit = form.handleSubmit((input) => {
    setSerialErrors([]);
    const body = new FormData();
    for (const [key, value] of Object.entries(input)) {
      if (key === 'serials' && source === 'file') continue;
      if (value !== undefined && value !== '') body.append(key, String(value));
    }
    if (receivedAt) body.append('receivedAt', new Date(receivedAt).toISOString());
    if (source === 'file' && serialFile) body.append('serialsFile', serialFile);
    for (const file of packingSlips) body.append('packingSlip', file);
    for (const file of certificates) body.append('certificate', file);
    receive.mutate(body, {
      onSuccess: onReceived,
      onError: (error) => {
        // Problems with serials come back with their line numbers; others name form fields.
        if (error instanceof ApiError && Array.isArray(error.details) && (error.details as LineMessage[])[0]?.line !== undefined)
          setSerialErrors(error.details as LineMessage[]);
        else showServerFieldErrors(error, form.setError);
      },
    });
  });

  const noLines = openLines.data && openLines.data.data.length === 0;
  return (
    <form onSubmit={submit} noValidate aria-label="Receive shipment" className="space-y-4">
      {receive.error && (
        <Notice tone="error" title="Nothing was received">
          {receive.error.message}
        </Notice>
      )}
      {noLines && <Notice tone="info">No purchase order is open. The buyer opens one before anything can be received.</Notice>}
      <Field label="PO line" htmlFor="receive-line" error={errors.poLineId?.message}>
        <select id="receive-line" className={inputClass} {...form.register('poLineId')}>
          <option value="">Choose the open PO line the shipment belongs to…</option>
          {openLines.data?.data.map((l) => (
            <option key={l.id} value={l.id}>
              {l.poNumber} / {l.lineNumber} · {l.partNumber} · {l.supplierName} ·{' '}
              {l.outstanding > 0 ? `${l.outstanding} of ${l.quantity} still expected` : `all ${l.quantity} received`}
            </option>
          ))}
        </select>
      </Field>
      {line && (
        <p className="-mt-2 text-xs text-ink-muted">
          {line.partDescription}. Received so far: {line.received}.
        </p>
      )}
      {candidates.length > 0 && (
        <Field
          label="Replacement for an NCR (optional)"
          htmlFor="receive-replacement"
          hint="When this shipment replaces pieces shipped back to the supplier."
          error={errors.replacementForNcrId?.message}
        >
          <select id="receive-replacement" className={`${inputClass} max-w-md`} {...form.register('replacementForNcrId')}>
            <option value="">Not a replacement</option>
            {candidates.map((n) => (
              <option key={n.id} value={n.id}>
                {n.number} · {plural(n.replacementOwed, 'piece')} owed
              </option>
            ))}
          </select>
        </Field>
      )}

      <div className="grid gap-3 sm:grid-cols-4">
        <Field label="Packing-slip number" htmlFor="receive-slip" error={errors.packingSlipNumber?.message}>
          <input id="receive-slip" className={`${inputClass} font-mono`} {...form.register('packingSlipNumber')} />
        </Field>
        <Field label="Supplier's lot number" htmlFor="receive-lot" error={errors.supplierLot?.message}>
          <input id="receive-lot" className={`${inputClass} font-mono`} {...form.register('supplierLot')} />
        </Field>
        <Field label="Carrier" htmlFor="receive-carrier" error={errors.carrier?.message}>
          <input id="receive-carrier" className={inputClass} {...form.register('carrier')} />
        </Field>
        <Field label="Received at" htmlFor="receive-at" hint="Leave blank for now.">
          <input id="receive-at" type="datetime-local" value={receivedAt} onChange={(e) => setReceivedAt(e.target.value)} className={inputClass} />
        </Field>
      </div>

      <div className="grid gap-3 sm:grid-cols-4">
        <Field label="Quantity" htmlFor="receive-quantity" error={errors.quantity?.message}>
          <input id="receive-quantity" inputMode="numeric" className={inputClass} {...form.register('quantity')} />
        </Field>
        <div className="sm:col-span-3">
          <Field label="Serial numbers" error={source === 'typed' ? errors.serials?.message : undefined}>
            <div className="mb-1 flex gap-4 text-sm">
              <label className="flex items-center gap-1.5">
                <input type="radio" name="serial-source" checked={source === 'typed'} onChange={() => setSource('typed')} /> Typed, pasted or a range
              </label>
              <label className="flex items-center gap-1.5">
                <input type="radio" name="serial-source" checked={source === 'file'} onChange={() => setSource('file')} /> From a CSV file
              </label>
            </div>
            {source === 'typed' ? (
              <div className="space-y-1.5">
                <SerialScanField
                  serials={form.watch('serials') ?? ''}
                  onChange={(serials) => form.setValue('serials', serials, { shouldValidate: form.formState.isSubmitted })}
                />
                <textarea
                  aria-label="Serial numbers"
                  rows={5}
                  spellCheck={false}
                  placeholder={'QW-0001..QW-0050\nor one per line, or separated by commas'}
                  className={`${inputClass} w-full font-mono`}
                  {...form.register('serials')}
                />
              </div>
            ) : (
              <input
                aria-label="Serial number file"
                type="file"
                accept=".csv,text/csv,text/plain"
                onChange={(e) => setSerialFile(e.target.files?.[0] ?? null)}
                className="text-sm"
              />
            )}
          </Field>
          <div className="mt-1">
            <SerialPreview text={source === 'typed' ? (form.watch('serials') ?? '') : ''} quantity={quantity} serverErrors={serialErrors} />
            {source === 'file' && (
              <p className="text-2xs text-ink-faint">One serial a row; a column headed “serial” is used if there is a header, else the first column.</p>
            )}
          </div>
        </div>
      </div>

      {overReceipt && (
        <div className="space-y-2">
          <Notice tone="caution" title="More than the line expects">
            Line {line.lineNumber} of {line.poNumber} still expects {line.outstanding}
            {replacing ? ` and ${replacing.number} is owed ${replacing.replacementOwed}` : ''}; {quantity} are being received. State why, or receive only what
            is expected.
          </Notice>
          <Field label="Reason for the extra pieces" htmlFor="receive-reason" error={errors.overReceiptReason?.message}>
            <textarea id="receive-reason" rows={2} className={inputClass} {...form.register('overReceiptReason')} />
          </Field>
        </div>
      )}

      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Packing slip" htmlFor="receive-slip-file" hint="PDF, PNG or JPEG, up to 20 MB.">
          <input
            id="receive-slip-file"
            type="file"
            accept={DOCUMENT_TYPES}
            onChange={(e) => setPackingSlips([...(e.target.files ?? [])])}
            className="text-sm"
          />
        </Field>
        <Field label="Supplier's certificate" htmlFor="receive-certificate" hint="The certificate of conformance; several files allowed.">
          <input
            id="receive-certificate"
            type="file"
            multiple
            accept={DOCUMENT_TYPES}
            onChange={(e) => setCertificates([...(e.target.files ?? [])])}
            className="text-sm"
          />
        </Field>
      </div>
      {oversized.length > 0 && <Notice tone="error">Larger than 20 MB: {oversized.join(', ')}</Notice>}

      <Button type="submit" disabled={receive.isPending || oversized.length > 0}>
        {receive.isPending ? 'Receiving…' : 'Receive into quarantine'}
      </Button>
    </form>
  );
}
