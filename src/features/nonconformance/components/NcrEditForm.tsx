import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { ncrUpdateSchema, type NcrUpdateInput, type NcrView } from '@shared/schemas/nonconformance';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useDefectCodes, useUpdateNcr } from '../api';
import { DefectCodePicker } from './DefectCodePicker';

/** Description, containment and defect codes of an NCR; `meId` takes the NCR over as its owner. */
export function NcrEditForm({ ncr, meId, onDone }: { ncr: NcrView; meId: number; onDone(): void }) {
  const save = useUpdateNcr(ncr.id);
  const codes = useDefectCodes();
  const form = useForm<NcrUpdateInput>({
    resolver: zodResolver(ncrUpdateSchema),
    defaultValues: { description: ncr.description, containment: ncr.containment, defectCodeIds: ncr.defects.map((d) => d.id), ownerId: ncr.owner?.id ?? null },
  });
  const errors = form.formState.errors;
  const chosen = (form.watch('defectCodeIds') ?? []).map(Number);
  const owner = form.watch('ownerId');
  const submit = form.handleSubmit((values) => save.mutate(values, { onSuccess: onDone, onError: (error) => showServerFieldErrors(error, form.setError) }));
  return (
    <form onSubmit={submit} noValidate aria-label="Change the NCR" className="space-y-3">
      {save.error && <Notice tone="error">{save.error.message}</Notice>}
      <Field label="Defect codes" error={errors.defectCodeIds?.message}>
        <DefectCodePicker codes={codes.data?.data ?? []} chosen={chosen} onChange={(ids) => form.setValue('defectCodeIds', ids)} idPrefix="edit-code" />
      </Field>
      <Field label="Description" htmlFor="edit-description" error={errors.description?.message}>
        <textarea id="edit-description" rows={3} className={inputClass} {...form.register('description')} />
      </Field>
      <Field label="Containment" htmlFor="edit-containment" error={errors.containment?.message}>
        <textarea id="edit-containment" rows={2} className={inputClass} {...form.register('containment')} />
      </Field>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" checked={Number(owner) === meId} onChange={(e) => form.setValue('ownerId', e.target.checked ? meId : (ncr.owner?.id ?? null))} />{' '}
        I own this NCR
      </label>
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending}>
          Save
        </Button>
        <Button look="quiet" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
