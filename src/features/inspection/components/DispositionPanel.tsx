// The lot's decision: the one in force as signed, and the signature form. Superseding a signed
// decision is a deliberate step (its own button, an empty form and a warning), never the form that
// stays armed after a signature.
import { useState } from 'react';
import { useForm, type UseFormRegister } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { PenLine } from 'lucide-react';
import { DISPOSITIONS, DISPOSITION_LABELS, SIGNATURE_MEANINGS, dispositionInputSchema, type DispositionInput } from '@shared/inspection/lotVerdict';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useCurrentDeviations, useSignDisposition } from '../api';
import type { LotInspectionView } from '@shared/schemas/inspection';
import { SignedDecision } from './SignedDecision';
import { formatDateTime } from '@shared/format';

type Signed = LotInspectionView['dispositions'][number];
type Signing = ReturnType<typeof useSignDisposition>;

export function DispositionPanel({ view, maySign }: { view: LotInspectionView; maySign: boolean }) {
  const sign = useSignDisposition(view.lot.id);
  const current = view.dispositions.find((d) => d.id === view.disposition?.id) ?? null;
  // The decision an open supersede form replaces: when someone else supersedes it meanwhile, the form closes.
  const [superseding, setSuperseding] = useState<number | null>(null);
  const inForce = view.documents.filter((d) => !d.revokedAt);
  const formOpen = maySign && (current ? superseding === current.id : view.verdict.proposal !== 'undecided');
  const failure = sign.error && <Notice tone="error">{sign.error.message}</Notice>;
  const signed = sign.isSuccess && (
    <Notice tone="info">Signed.{sign.data.documents.length > 0 && ` Documents issued: ${sign.data.documents.map((d) => d.number).join(', ')}.`}</Notice>
  );

  const form = (
    <SignatureForm
      key={current?.id ?? 'first'}
      view={view}
      sign={sign}
      replaces={current}
      inForce={inForce}
      onSigned={() => setSuperseding(null)}
      onCancel={() => {
        sign.reset();
        setSuperseding(null);
      }}
    />
  );
  if (!current) {
    if (!maySign) return null;
    if (!formOpen)
      return (
        <Notice tone="info" title="Not ready for a decision">
          {view.verdict.explanation}. Every sample piece needs a complete result first.
        </Notice>
      );
    return form;
  }
  return (
    <div className="space-y-3">
      <SignedDecision
        disposition={current}
        documents={inForce}
        actions={
          maySign &&
          !formOpen && (
            <div className="flex flex-wrap items-center gap-3 border-t border-paper-line pt-3">
              <Button
                look="secondary"
                onClick={() => {
                  sign.reset();
                  setSuperseding(current.id);
                }}
              >
                Supersede this decision…
              </Button>
              <span className="text-xs text-ink-muted">Only to replace this decision with a new signature; it stays on record as superseded.</span>
            </div>
          )
        }
      >
        {!formOpen && (failure || signed)}
        {view.sort && (
          <Notice tone="info" title="100 % sort under way">
            {view.sort.remaining} of {view.lot.quantity} pieces still need a verdict. When the last one is measured, each piece goes by its own verdict
            (conforming to stock, nonconforming back to the vendor) and the certificate is issued for the released serials.
          </Notice>
        )}
      </SignedDecision>
      {formOpen && form}
    </div>
  );
}

type FormProps = {
  view: LotInspectionView;
  sign: Signing;
  /** The signed decision this signature supersedes; null for the lot's first decision. */
  replaces: Signed | null;
  inForce: LotInspectionView['documents'];
  onSigned(): void;
  onCancel(): void;
};

function SignatureForm({ view, sign, replaces, inForce, onSigned, onCancel }: FormProps) {
  const proposal = view.verdict.proposal;
  // A first decision starts from what the sample proposes; a superseding one starts empty.
  const form = useForm<DispositionInput>({
    resolver: zodResolver(dispositionInputSchema),
    defaultValues: {
      decision: replaces ? undefined : proposal === 'reject' ? 'reject' : 'accept',
      password: '',
      meaningAcknowledged: false as unknown as true,
      expectedDispositionId: replaces?.id ?? null,
    },
  });
  const decision = form.watch('decision') as DispositionInput['decision'] | undefined;
  const errors = form.formState.errors;
  const submit = form.handleSubmit((values) =>
    sign.mutate(
      { ...values, expectedDispositionId: replaces?.id ?? null },
      {
        onSuccess: onSigned,
        // The typed decision and note stay; a refused or spent password is typed again.
        onError: () => {
          form.setValue('password', '');
          form.setFocus('password');
        },
      },
    ),
  );

  return (
    <form onSubmit={submit} noValidate aria-label="Sign disposition" className="space-y-3 rounded border border-frame/30 bg-paper-card p-4">
      <h2 className="flex items-center gap-2">
        <PenLine className="h-4 w-4" aria-hidden /> {replaces ? 'Supersede the signed decision' : 'Sign the disposition'}
      </h2>
      {replaces && (
        <Notice tone="caution" title="What superseding does">
          The decision “{DISPOSITION_LABELS[replaces.decision]}” signed by {replaces.signer ?? 'a former user'} on {formatDateTime(replaces.signedAt)} stays on
          record as superseded.
          {inForce.length > 0 && ` Its documents (${inForce.map((d) => d.number).join(', ')}) are revoked.`} Your decision is signed in its place, with its own
          documents, and the lot's pieces move as your decision says.
        </Notice>
      )}
      {sign.error && <Notice tone="error">{sign.error.message}</Notice>}
      <fieldset className="flex flex-wrap gap-4">
        <legend className="mb-1 text-xs font-medium text-ink-muted">Decision (the sample proposes: {proposal})</legend>
        {DISPOSITIONS.map((d) => (
          <label key={d} className="inline-flex items-center gap-1.5 text-sm">
            <input type="radio" value={d} {...form.register('decision')} /> {DISPOSITION_LABELS[d]}
          </label>
        ))}
        {errors.decision && (
          <p role="alert" className="w-full text-xs text-state-fail">
            Choose a decision.
          </p>
        )}
      </fieldset>
      {decision === 'use-as-is' && (
        <DeviationPicker view={view} register={form.register} error={errors.deviationId?.message} chosen={form.watch('deviationId')} />
      )}
      <Field label={decision === 'use-as-is' ? 'Justification' : 'Note (optional)'} htmlFor="justification" error={errors.justification?.message}>
        <textarea id="justification" rows={2} className={inputClass} {...form.register('justification')} />
      </Field>
      <div className="rounded border border-paper-line bg-paper px-3 py-2 text-sm">
        <p className="text-xs font-medium text-ink-muted">Meaning of your signature</p>
        <p>{decision ? SIGNATURE_MEANINGS[decision] : 'Choose a decision to read what your signature will mean.'}</p>
        <label className="mt-2 flex items-center gap-2 text-sm">
          <input type="checkbox" {...form.register('meaningAcknowledged')} /> I have read the meaning of this signature and sign accordingly.
        </label>
        {errors.meaningAcknowledged && <p className="text-xs text-state-fail">{errors.meaningAcknowledged.message}</p>}
      </div>
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Your password (re-entered to sign)" htmlFor="sign-password" error={errors.password?.message}>
          <input id="sign-password" type="password" autoComplete="current-password" className={inputClass} {...form.register('password')} />
        </Field>
        <Button type="submit" look={decision === 'reject' ? 'danger' : 'primary'} disabled={sign.isPending}>
          {sign.isPending ? 'Signing…' : decision ? `Sign: ${DISPOSITION_LABELS[decision]}` : 'Sign'}
        </Button>
        {replaces && (
          <Button look="quiet" onClick={onCancel}>
            Keep the signed decision
          </Button>
        )}
      </div>
      <p className="text-xs text-ink-muted">
        The decision remains the responsibility of the site's quality system and its procedures. A signed decision is never edited; a new signature supersedes
        it and revokes its documents.
      </p>
    </form>
  );
}

type PickerProps = { view: LotInspectionView; register: UseFormRegister<DispositionInput>; error?: string; chosen: number | undefined };

/** The current deviations of the lot's supplier and part; one that cannot cover every piece of the lot is shown but cannot be chosen. */
function DeviationPicker({ view, register, error, chosen }: PickerProps) {
  const { supplier, part, quantity } = view.lot;
  const deviations = useCurrentDeviations(supplier.id, part.id, true);
  const rows = deviations.data?.data ?? [];
  const picked = rows.find((d) => d.id === chosen);
  const newEntry = `/deviations/new?supplierId=${supplier.id}&partId=${part.id}`;
  if (deviations.isPending) return <p className="text-sm text-ink-muted">Reading the deviation register…</p>;
  if (deviations.isError) return <Notice tone="error">{deviations.error.message}</Notice>;
  if (rows.length === 0) {
    return (
      <Notice tone="caution" title="No current deviation">
        No approved, unexpired deviation of {part.number} from {supplier.name} is in the register.{' '}
        <Link to={newEntry} className="underline">
          Write one
        </Link>
        ; it needs the approval of a quality manager and of a second person before this lot can be used under it.
      </Notice>
    );
  }
  return (
    <div className="space-y-2">
      <Field label="Deviation" htmlFor="deviation" hint={`Every piece of the lot (${quantity}) is released under it.`} error={error}>
        <select
          id="deviation"
          className={`${inputClass} max-w-xl`}
          {...register('deviationId', { setValueAs: (v) => (v === '' || v === undefined ? undefined : Number(v)) })}
        >
          <option value="">Choose a current deviation…</option>
          {rows.map((d) => (
            <option key={d.id} value={d.id} disabled={(d.quantityLeft ?? 0) < quantity}>
              {d.number}: {d.quantityLeft} of {d.quantityLimit} pieces left, until {d.expiresOn}
              {(d.quantityLeft ?? 0) < quantity ? ' (too few left for this lot)' : ''}
            </option>
          ))}
        </select>
      </Field>
      {picked && (
        <p className="rounded border border-paper-line bg-paper px-3 py-2 text-sm" data-testid="deviation-allowed">
          <span className="text-xs font-medium text-ink-muted">What {picked.number} allows: </span>
          {picked.allowed}
        </p>
      )}
    </div>
  );
}
