// The part and its ordered specification. Fields that belong to one construction (the order of a
// multi-order plate, the band of an achromatic one) appear only for it.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { partInputSchema, type PartInput, type PartView } from '@shared/schemas/purchasing';
import { CONSTRUCTIONS, CONSTRUCTION_LABELS, DECISION_RULES, DECISION_RULE_LABELS, MATERIALS, MATERIAL_LABELS } from '@shared/schemas/spec';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useSavePart } from '../api';

const blankSpec: PartInput['spec'] = {
  nominalWaves: '',
  designWavelengthNm: '',
  retardanceTolWaves: '',
  axisTolDeg: '',
  construction: 'zero-order',
  multiOrder: '',
  bandNm: ['', ''],
  material: 'quartz',
  clearApertureMm: '',
  diameterMm: '',
  maxDiattenuation: '',
  maxDepolarization: '',
  decisionRule: 'simple',
};

export function PartForm({ part, onSaved, onCancel }: { part?: PartView; onSaved: (part: PartView) => void; onCancel: () => void }) {
  const save = useSavePart();
  const form = useForm({
    resolver: zodResolver(partInputSchema),
    defaultValues: part
      ? { number: part.number, description: part.description, active: part.active, spec: { ...blankSpec, ...part.spec, bandNm: part.spec.bandNm ?? ['', ''] } }
      : { number: '', description: '', active: true, spec: blankSpec },
  });
  const errors = form.formState.errors;
  const specErrors = errors.spec ?? {};
  const construction = form.watch('spec.construction');
  const submit = form.handleSubmit((input) =>
    save.mutate({ id: part?.id, input }, { onSuccess: onSaved, onError: (error) => showServerFieldErrors(error, form.setError) }),
  );
  const number = (name: Parameters<typeof form.register>[0], label: string, error?: string, hint?: string) => (
    <Field label={label} htmlFor={`part-${name}`} error={error} hint={hint}>
      <input id={`part-${name}`} inputMode="decimal" className={inputClass} {...form.register(name)} />
    </Field>
  );
  return (
    <form onSubmit={submit} noValidate aria-label={part ? `Edit ${part.number}` : 'New part'} className="space-y-4">
      {save.error && <Notice tone="error">{save.error.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Part number" htmlFor="part-number" error={errors.number?.message}>
          <input id="part-number" className={`${inputClass} font-mono`} {...form.register('number')} />
        </Field>
        <div className="sm:col-span-2">
          <Field label="Description" htmlFor="part-description" error={errors.description?.message}>
            <input id="part-description" className={inputClass} {...form.register('description')} />
          </Field>
        </div>
      </div>
      <fieldset className="space-y-3 rounded border border-paper-line p-3">
        <legend className="px-1 text-xs font-semibold text-ink-muted">Ordered specification</legend>
        <div className="grid gap-3 sm:grid-cols-4">
          {number('spec.nominalWaves', 'Nominal retardance (waves)', specErrors.nominalWaves?.message, '0.25 quarter-wave, 0.5 half-wave')}
          {number('spec.designWavelengthNm', 'Design wavelength (nm)', specErrors.designWavelengthNm?.message)}
          {number('spec.retardanceTolWaves', 'Retardance tolerance ± (waves)', specErrors.retardanceTolWaves?.message)}
          {number('spec.axisTolDeg', 'Fast-axis tolerance ± (°)', specErrors.axisTolDeg?.message)}
          <Field label="Construction" htmlFor="part-construction">
            <select id="part-construction" className={inputClass} {...form.register('spec.construction')}>
              {CONSTRUCTIONS.map((c) => (
                <option key={c} value={c}>
                  {CONSTRUCTION_LABELS[c]}
                </option>
              ))}
            </select>
          </Field>
          {construction === 'multi-order' && number('spec.multiOrder', 'Order', specErrors.multiOrder?.message, 'Whole waves beyond the nominal')}
          {construction === 'achromatic' && (
            <>
              {number('spec.bandNm.0', 'Band from (nm)', specErrors.bandNm?.[0]?.message ?? specErrors.bandNm?.message)}
              {number('spec.bandNm.1', 'Band to (nm)', specErrors.bandNm?.[1]?.message)}
            </>
          )}
          <Field label="Material" htmlFor="part-material">
            <select id="part-material" className={inputClass} {...form.register('spec.material')}>
              {MATERIALS.map((m) => (
                <option key={m} value={m}>
                  {MATERIAL_LABELS[m]}
                </option>
              ))}
            </select>
          </Field>
          {number('spec.clearApertureMm', 'Clear aperture (mm)', specErrors.clearApertureMm?.message)}
          {number('spec.diameterMm', 'Diameter (mm)', specErrors.diameterMm?.message)}
          {number('spec.maxDiattenuation', 'Max. diattenuation', specErrors.maxDiattenuation?.message, 'Optional, 0 to 1')}
          {number('spec.maxDepolarization', 'Max. depolarisation', specErrors.maxDepolarization?.message, 'Optional, 0 to 1')}
        </div>
        <Field label="Decision rule">
          <div className="flex flex-wrap gap-4 text-sm">
            {DECISION_RULES.map((rule) => (
              <label key={rule} className="flex items-center gap-1.5">
                <input type="radio" value={rule} {...form.register('spec.decisionRule')} /> {DECISION_RULE_LABELS[rule]}
              </label>
            ))}
          </div>
        </Field>
      </fieldset>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" {...form.register('active')} /> Active (may be put on new orders)
      </label>
      {part && <Notice tone="info">Orders already placed keep the specification they were ordered with; a change applies to new PO lines.</Notice>}
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending}>
          {part ? 'Save part' : 'Create part'}
        </Button>
        <Button look="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
