import { useRef } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { todayUtc } from '@shared/calibration';
import { calibrationInputSchema, RETARDANCE_UNCERTAINTY_UNITS, type CalibrationInput } from '@shared/schemas/instruments';
import { Button } from '@/components/Button';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { ApiError } from '@/lib/api';
import { useRecordCalibration } from '../api';

const blank: CalibrationInput = {
  calibratedOn: todayUtc(),
  dueOn: '',
  performedBy: '',
  certificateNumber: '',
  uncertaintyRetardance: '',
  uncertaintyRetardanceUnit: '',
  uncertaintyAngleDeg: '',
  uncertaintyNote: '',
};

/** Records a calibration with the uncertainties its certificate states, and the certificate PDF. */
export function CalibrationForm({ instrumentId, onDone }: { instrumentId: number; onDone: () => void }) {
  const record = useRecordCalibration(instrumentId);
  const certificate = useRef<HTMLInputElement>(null);
  const form = useForm<CalibrationInput>({ resolver: zodResolver(calibrationInputSchema) as never, defaultValues: blank });
  const errors = form.formState.errors;
  const serverErrors = record.error instanceof ApiError ? record.error.fieldErrors() : {};
  const errorOf = (field: keyof CalibrationInput) => errors[field]?.message ?? serverErrors[field];
  const submit = form.handleSubmit(async (values) => {
    const body = new FormData();
    for (const [name, value] of Object.entries(values)) if (value !== undefined && value !== null) body.append(name, String(value));
    const file = certificate.current?.files?.[0];
    if (file) body.append('certificate', file);
    await record.mutateAsync(body);
    onDone();
  });
  return (
    <form onSubmit={submit} noValidate aria-label="Record a calibration" className="space-y-3">
      {record.error && <Notice tone="error">{record.error.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Calibrated on" htmlFor="cal-on" error={errorOf('calibratedOn')}>
          <input id="cal-on" {...isoDateInput} className={inputClass} {...form.register('calibratedOn')} />
        </Field>
        <Field label="Due on" htmlFor="cal-due" error={errorOf('dueOn')}>
          <input id="cal-due" {...isoDateInput} className={inputClass} {...form.register('dueOn')} />
        </Field>
        <Field label="Certificate number" htmlFor="cal-number" error={errorOf('certificateNumber')}>
          <input id="cal-number" className={inputClass} {...form.register('certificateNumber')} />
        </Field>
        <div className="sm:col-span-3">
          <Field label="Performed by (laboratory or person)" htmlFor="cal-by" error={errorOf('performedBy')}>
            <input id="cal-by" className={inputClass} {...form.register('performedBy')} />
          </Field>
        </div>
        <Field label="Stated uncertainty, retardance" htmlFor="cal-ur" error={errorOf('uncertaintyRetardance')}>
          <input id="cal-ur" type="number" step="any" min="0" className={inputClass} {...form.register('uncertaintyRetardance')} />
        </Field>
        <Field label="Unit of the retardance uncertainty" htmlFor="cal-unit" error={errorOf('uncertaintyRetardanceUnit')}>
          <select id="cal-unit" className={inputClass} {...form.register('uncertaintyRetardanceUnit')}>
            <option value="">none stated</option>
            {RETARDANCE_UNCERTAINTY_UNITS.map((unit) => (
              <option key={unit} value={unit}>
                {unit === 'waves' ? 'waves (λ)' : 'nm'}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Stated uncertainty, fast axis (°)" htmlFor="cal-ua" error={errorOf('uncertaintyAngleDeg')}>
          <input id="cal-ua" type="number" step="any" min="0" className={inputClass} {...form.register('uncertaintyAngleDeg')} />
        </Field>
        <div className="sm:col-span-3">
          <Field label="Note on the uncertainties (coverage factor, wavelength…)" htmlFor="cal-note" error={errorOf('uncertaintyNote')}>
            <input id="cal-note" className={inputClass} {...form.register('uncertaintyNote')} />
          </Field>
        </div>
        <div className="sm:col-span-3">
          <Field label="Calibration certificate (PDF, up to 10 MB)" htmlFor="cal-certificate">
            <input id="cal-certificate" ref={certificate} type="file" accept="application/pdf" className="block text-sm" />
          </Field>
        </div>
      </div>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={record.isPending}>
          Record calibration
        </Button>
        <Button look="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
