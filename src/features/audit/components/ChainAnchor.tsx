import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { auditAnchorSchema, type AuditAnchor } from '@shared/schemas/audit';
import { Button } from '@/components/Button';
import { Details, Panel } from '@/components/Details';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useChainHead, useCheckAnchor } from '../api';
import { CopyButton } from './CopyButton';
import { formatDateTime } from '@shared/format';

type AnchorInput = z.input<typeof auditAnchorSchema>;

/** The last link of the audit chain, to be copied somewhere Phaselot cannot reach (a paper log, a
 * mail to the auditor); and the check of such a copy against the trail later. */
export function ChainAnchor() {
  const head = useChainHead();
  const check = useCheckAnchor();
  const form = useForm<AnchorInput, unknown, AuditAnchor>({ resolver: zodResolver(auditAnchorSchema), defaultValues: { seq: '', hash: '' } });
  const submit = form.handleSubmit((values) => check.mutate(values));
  const current = head.data;
  return (
    <Panel title="Chain head">
      <div className="space-y-3">
        <p className="text-xs text-ink-muted">
          Keep the position and hash below outside Phaselot. If the event at that position still carries that hash and the chain verifies, nothing recorded up
          to then has changed.
        </p>
        {head.error && <Notice tone="error">{head.error.message}</Notice>}
        {current && (
          <Details
            columns={3}
            items={[
              [
                'Position',
                <span className="font-mono" data-testid="chain-head-seq">
                  {current.seq}
                </span>,
              ],
              [
                'Hash',
                current.hash ? (
                  <span className="inline-flex items-start gap-1">
                    <span className="font-mono text-2xs break-all" data-testid="chain-head-hash">
                      {current.hash}
                    </span>
                    <CopyButton value={`${current.seq} ${current.hash}`} label="Copy position and hash" />
                  </span>
                ) : (
                  'No event recorded yet'
                ),
              ],
              ['Recorded', current.occurredAt ? formatDateTime(current.occurredAt) : '—'],
            ]}
          />
        )}
        <form aria-label="Check an anchor" onSubmit={submit} noValidate className="flex flex-wrap items-end gap-2 border-t border-paper-line pt-3">
          <Field label="Anchored position" htmlFor="anchor-seq" error={form.formState.errors.seq?.message}>
            <input id="anchor-seq" inputMode="numeric" className={`${inputClass} w-28 font-mono`} {...form.register('seq')} />
          </Field>
          <div className="min-w-0 flex-1 basis-72">
            <Field label="Anchored hash" htmlFor="anchor-hash" error={form.formState.errors.hash?.message}>
              <input id="anchor-hash" spellCheck={false} className={`${inputClass} w-full font-mono text-xs`} {...form.register('hash')} />
            </Field>
          </div>
          <Button type="submit" look="secondary" disabled={check.isPending}>
            {check.isPending ? 'Checking…' : 'Check anchor'}
          </Button>
        </form>
        {check.error && <Notice tone="error">{check.error.message}</Notice>}
        {check.data && (
          <Notice tone={check.data.matches ? 'info' : 'error'} title={check.data.matches ? 'Anchor matches' : 'Anchor does not match'}>
            {check.data.message}
          </Notice>
        )}
      </div>
    </Panel>
  );
}
