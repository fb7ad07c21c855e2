// The clerk's stock moves. Each names pieces by part and serial (serials are unique within a part);
// the server refuses the whole move if any piece is not where, or in the state, the move needs.
import { useForm, type FieldValues, type Path, type UseFormReturn } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { issueInputSchema, lotName, releaseInputSchema, transferInputSchema } from '@shared/schemas/stock';
import { parseSerialText } from '@shared/serials';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useIssue, useLocations, useRelease, useStockParts, useTransfer } from '../api';
import { plural } from '@shared/format';

type Done = (message: string) => void;

function SerialsField<T extends FieldValues>({ form, optional }: { form: UseFormReturn<T>; optional?: string }) {
  const name = 'serials' as Path<T>;
  const text = String(form.watch(name) ?? '');
  const list = parseSerialText(text);
  const error = form.formState.errors.serials?.message;
  return (
    <Field
      label="Serial numbers"
      htmlFor="move-serials"
      error={typeof error === 'string' ? error : undefined}
      hint={optional ?? 'One per line, separated by commas, or ranges such as QW-0001..QW-0010.'}
    >
      <textarea id="move-serials" rows={4} spellCheck={false} className={`${inputClass} font-mono`} {...form.register(name)} />
      {text.trim() && (
        <p className="text-xs text-ink-muted">
          {plural(list.serials.length, 'serial number')}
          {list.errors.map((e) => (
            <span key={e.line + e.message} className="block text-state-fail">
              Line {e.line}: {e.message}
            </span>
          ))}
        </p>
      )}
    </Field>
  );
}

function PartField<T extends FieldValues>({ form }: { form: UseFormReturn<T> }) {
  const parts = useStockParts();
  const error = form.formState.errors.partId?.message;
  return (
    <Field label="Part" htmlFor="move-part" error={typeof error === 'string' ? error : undefined}>
      <select id="move-part" className={inputClass} {...form.register('partId' as Path<T>)}>
        <option value="">Choose the part…</option>
        {parts.data?.data.map((p) => (
          <option key={p.id} value={p.id}>
            {p.number} — {p.description}
          </option>
        ))}
      </select>
    </Field>
  );
}

function BinField<T extends FieldValues>({ form, label }: { form: UseFormReturn<T>; label: string }) {
  const locations = useLocations();
  const error = form.formState.errors.toLocationId?.message;
  return (
    <Field label={label} htmlFor="move-bin" error={typeof error === 'string' ? error : undefined}>
      <select id="move-bin" className={inputClass} {...form.register('toLocationId' as Path<T>)}>
        <option value="">Choose a stock bin…</option>
        {locations.data?.data
          .filter((l) => l.kind === 'stock' && l.active)
          .map((l) => (
            <option key={l.id} value={l.id}>
              {l.code} — {l.name}
            </option>
          ))}
      </select>
    </Field>
  );
}

export function IssueForm({ onDone }: { onDone: Done }) {
  const issue = useIssue();
  const form = useForm({ resolver: zodResolver(issueInputSchema), defaultValues: { partId: '', serials: '', workOrder: '' } });
  const submit = form.handleSubmit((input) =>
    issue.mutate(input, {
      onSuccess: (r) => {
        form.reset();
        onDone(`${plural(r.moved, 'piece')} issued to work order ${input.workOrder}.`);
      },
      onError: (e) => showServerFieldErrors(e, form.setError),
    }),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Issue to work order" className="space-y-3">
      {issue.error && (
        <Notice tone="error" title="Nothing was issued">
          {issue.error.message}
        </Notice>
      )}
      <div className="grid gap-3 sm:grid-cols-2">
        <PartField form={form} />
        <Field label="Work order" htmlFor="move-wo" error={form.formState.errors.workOrder?.message}>
          <input id="move-wo" className={`${inputClass} font-mono`} {...form.register('workOrder')} />
        </Field>
      </div>
      <SerialsField form={form} />
      <Button type="submit" disabled={issue.isPending}>
        Issue
      </Button>
    </form>
  );
}

export function TransferForm({ onDone }: { onDone: Done }) {
  const transfer = useTransfer();
  const form = useForm({ resolver: zodResolver(transferInputSchema), defaultValues: { partId: '', serials: '', toLocationId: '' } });
  const submit = form.handleSubmit((input) =>
    transfer.mutate(input, {
      onSuccess: (r) => {
        form.reset();
        onDone(`${plural(r.moved, 'piece')} transferred.`);
      },
      onError: (e) => showServerFieldErrors(e, form.setError),
    }),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Transfer between bins" className="space-y-3">
      {transfer.error && (
        <Notice tone="error" title="Nothing was moved">
          {transfer.error.message}
        </Notice>
      )}
      <div className="grid gap-3 sm:grid-cols-2">
        <PartField form={form} />
        <BinField form={form} label="To bin" />
      </div>
      <SerialsField form={form} />
      <Button type="submit" disabled={transfer.isPending}>
        Transfer
      </Button>
    </form>
  );
}

export function PutAwayForm({ lotId, onDone }: { lotId?: string; onDone: Done }) {
  const release = useRelease();
  const form = useForm({ resolver: zodResolver(releaseInputSchema), defaultValues: { lotId: lotId ?? '', toLocationId: '', serials: '' } });
  const submit = form.handleSubmit((input) =>
    release.mutate(input, {
      onSuccess: (r) => {
        form.reset({ lotId: '', toLocationId: '', serials: '' });
        onDone(`${plural(r.moved, 'piece')} of lot ${lotName(Number(input.lotId))} put away.`);
      },
      onError: (e) => showServerFieldErrors(e, form.setError),
    }),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Put away an accepted lot" className="space-y-3">
      {release.error && (
        <Notice tone="error" title="Nothing was put away">
          {release.error.message}
        </Notice>
      )}
      <div className="grid gap-3 sm:grid-cols-2">
        <Field
          label="Lot number"
          htmlFor="move-lot"
          error={form.formState.errors.lotId?.message}
          hint={`The lot's number, e.g. 12 for ${lotName(12)}. Only accepted lots go to stock.`}
        >
          <input id="move-lot" inputMode="numeric" className={`${inputClass} font-mono`} {...form.register('lotId')} />
        </Field>
        <BinField form={form} label="Into bin" />
      </div>
      <SerialsField form={form} optional="Leave blank to put away every piece of the lot still waiting." />
      <Button type="submit" disabled={release.isPending}>
        Put away
      </Button>
    </form>
  );
}
