import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import {
  INSTRUMENT_KINDS,
  INSTRUMENT_KIND_LABELS,
  instrumentInputSchema,
  instrumentUpdateSchema,
  type InstrumentInput,
  type InstrumentView,
} from '@shared/schemas/instruments';
import { Button } from '@/components/Button';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useSaveInstrument } from '../api';

const blank: InstrumentInput = {
  code: '',
  kind: 'stokes-polarimeter',
  description: '',
  s3Sign: 1,
  angleSign: 1,
  uncertaintyWaves: 0.001,
  uncertaintyDeg: 0.1,
  calibratedOn: '',
  calibrationDueOn: '',
  active: true,
};

/** Registers an instrument with its current calibration, or edits its entry (the calibration dates then change only by recording a calibration). */
export function InstrumentForm({ instrument, onDone }: { instrument?: InstrumentView; onDone: () => void }) {
  const save = useSaveInstrument();
  const form = useForm<InstrumentInput>({
    resolver: zodResolver(instrument ? instrumentUpdateSchema : instrumentInputSchema) as never,
    defaultValues: instrument ?? blank,
  });
  const errors = form.formState.errors;
  const submit = form.handleSubmit((values) => save.mutate({ ...values, id: instrument?.id }, { onSuccess: onDone }));
  const signOptions = [
    { value: 1, label: 'as in our convention' },
    { value: -1, label: 'reversed' },
  ];
  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={instrument ? `Edit ${instrument.code}` : 'New instrument'}
      className="mb-4 space-y-3 rounded border border-paper-line bg-paper-card p-4"
    >
      {save.error && <Notice tone="error">{save.error.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-4">
        <Field label="Code" htmlFor="ins-code" error={errors.code?.message}>
          <input id="ins-code" className={inputClass} {...form.register('code')} />
        </Field>
        <Field label="Kind" htmlFor="ins-kind" error={errors.kind?.message}>
          <select id="ins-kind" className={inputClass} {...form.register('kind')}>
            {INSTRUMENT_KINDS.map((k) => (
              <option key={k} value={k}>
                {INSTRUMENT_KIND_LABELS[k]}
              </option>
            ))}
          </select>
        </Field>
        <div className="sm:col-span-2">
          <Field label="Description" htmlFor="ins-description" error={errors.description?.message}>
            <input id="ins-description" className={inputClass} {...form.register('description')} />
          </Field>
        </div>
        <Field label="Expanded uncertainty, retardance (waves, k = 2)" htmlFor="ins-uw" error={errors.uncertaintyWaves?.message}>
          <input id="ins-uw" type="number" step="0.0001" className={inputClass} {...form.register('uncertaintyWaves')} />
        </Field>
        <Field label="Expanded uncertainty, fast axis (°, k = 2)" htmlFor="ins-ud" error={errors.uncertaintyDeg?.message}>
          <input id="ins-ud" type="number" step="0.01" className={inputClass} {...form.register('uncertaintyDeg')} />
        </Field>
        {!instrument && (
          <>
            <Field label="Calibrated on" htmlFor="ins-cal" error={errors.calibratedOn?.message} hint="Its first calibration record">
              <input id="ins-cal" {...isoDateInput} className={inputClass} {...form.register('calibratedOn')} />
            </Field>
            <Field label="Calibration due" htmlFor="ins-due" error={errors.calibrationDueOn?.message}>
              <input id="ins-due" {...isoDateInput} className={inputClass} {...form.register('calibrationDueOn')} />
            </Field>
          </>
        )}
        <Field label="S3 sign in its exports" htmlFor="ins-s3">
          <select id="ins-s3" className={inputClass} {...form.register('s3Sign', { valueAsNumber: true })}>
            {signOptions.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Angle direction in its exports" htmlFor="ins-angle">
          <select id="ins-angle" className={inputClass} {...form.register('angleSign', { valueAsNumber: true })}>
            {signOptions.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </Field>
        <label className="flex items-center gap-2 self-end pb-2 text-sm">
          <input type="checkbox" {...form.register('active')} /> In use
        </label>
      </div>
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending}>
          {instrument ? 'Save changes' : 'Register instrument'}
        </Button>
        <Button look="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
