// Opening an NCR by hand for pieces found nonconforming after receipt (at assembly, in stores): the
// pieces go to material review as it is saved.
import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { ncrOpenSchema, type NcrOpenInput } from '@shared/schemas/nonconformance';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useDefectCodes, useOpenNcr, usePartChoices } from '../api';
import { DefectCodePicker } from '../components/DefectCodePicker';

export function OpenNcrPage() {
  const navigate = useNavigate();
  const open = useOpenNcr();
  const codes = useDefectCodes();
  const [partQuery, setPartQuery] = useState('');
  const parts = usePartChoices(partQuery);
  const form = useForm<NcrOpenInput>({
    resolver: zodResolver(ncrOpenSchema),
    defaultValues: { partId: undefined as unknown as number, serials: '', defectCodeIds: [], description: '', containment: '' },
  });
  const errors = form.formState.errors;
  const chosen = (form.watch('defectCodeIds') ?? []).map(Number);
  const submit = form.handleSubmit((values) =>
    open.mutate(values, { onSuccess: (ncr) => navigate(`/nonconformances/${ncr.id}`), onError: (error) => showServerFieldErrors(error, form.setError) }),
  );
  return (
    <div className="max-w-3xl">
      <PageHeader
        title="Open an NCR"
        subtitle="For pieces found nonconforming after receipt: at assembly, at kitting, in stores. They are taken into material review."
      />
      <form onSubmit={submit} noValidate aria-label="Open an NCR" className="space-y-3 rounded border border-paper-line bg-paper-card p-4">
        {open.error && <Notice tone="error">{open.error.message}</Notice>}
        <div className="grid gap-3 sm:grid-cols-2">
          <Field label="Find the part" htmlFor="ncr-part-search" hint="Part number or description.">
            <input id="ncr-part-search" type="search" className={inputClass} value={partQuery} onChange={(e) => setPartQuery(e.target.value)} />
          </Field>
          <Field label="Part" htmlFor="ncr-part" error={errors.partId?.message && 'Choose the part'}>
            <select id="ncr-part" className={inputClass} {...form.register('partId')}>
              <option value="">Choose…</option>
              {parts.data?.data.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.number} · {p.description}
                </option>
              ))}
            </select>
          </Field>
        </div>
        <Field
          label="Serial numbers"
          htmlFor="ncr-serials"
          hint="One per line, or separated by commas; ranges such as QW-0001..QW-0005."
          error={errors.serials?.message}
        >
          <textarea id="ncr-serials" rows={3} className={`${inputClass} font-mono`} {...form.register('serials')} />
        </Field>
        <Field label="Defect codes" error={errors.defectCodeIds?.message}>
          <DefectCodePicker
            codes={codes.data?.data ?? []}
            chosen={chosen}
            onChange={(ids) => form.setValue('defectCodeIds', ids, { shouldValidate: form.formState.isSubmitted })}
            idPrefix="ncr-code"
          />
        </Field>
        <Field label="What was found" htmlFor="ncr-description" error={errors.description?.message}>
          <textarea id="ncr-description" rows={3} className={inputClass} {...form.register('description')} />
        </Field>
        <Field
          label="Containment"
          htmlFor="ncr-containment"
          hint="What was done at once: pieces pulled, builds stopped, stock checked."
          error={errors.containment?.message}
        >
          <textarea id="ncr-containment" rows={2} className={inputClass} {...form.register('containment')} />
        </Field>
        <Button type="submit" disabled={open.isPending}>
          {open.isPending ? 'Opening…' : 'Open the NCR'}
        </Button>
      </form>
    </div>
  );
}
