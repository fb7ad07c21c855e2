import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { can } from '@shared/policies';
import {
  DEVIATION_APPROVAL_MEANINGS,
  deviationApprovalSchema,
  deviationWithdrawalSchema,
  type DeviationApprovalInput,
  type DeviationView,
} from '@shared/schemas/deviations';
import { lotName } from '@shared/schemas/stock';
import { Button } from '@/components/Button';
import { Details, Panel } from '@/components/Details';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { SignatureFields } from '@/components/SignatureFields';
import { useSession } from '@/lib/session';
import { useApproveDeviation, useDeviation, useWithdrawDeviation } from '../api';
import { DeviationBadge } from '../components/Badges';
import { DeviationForm } from '../components/DeviationForm';
import { formatDateTime, plural } from '@shared/format';

export function DeviationPage() {
  const id = Number(useParams().deviationId);
  const { data: user } = useSession();
  const query = useDeviation(id);
  const [editing, setEditing] = useState(false);
  if (query.error) return <Notice tone="error">{query.error.message}</Notice>;
  if (!query.data) return <p className="text-ink-muted">Loading…</p>;
  const d = query.data;
  const open = !d.recordedBeforeRegister && !d.withdrawn;
  const mayEdit = can(user, 'deviations.manage') && open && d.approvals === 0;
  const mayApprove = can(user, 'deviations.approve') && open && d.approvals < 2;
  const mayWithdraw = can(user, 'deviations.manage') && open;
  return (
    <div className="max-w-5xl space-y-3">
      <PageHeader
        title={`Deviation ${d.number}`}
        subtitle={
          <>
            {d.part.number} · {d.part.description} from {d.supplier.name} · <Link to="/deviations">the register</Link>
          </>
        }
        actions={<DeviationBadge status={d.status} />}
      />
      {d.recordedBeforeRegister && (
        <Notice tone="info" title="Recorded before the register">
          This entry was made from the deviation number of an earlier use-as-is decision. No quantity, expiry or approvals were recorded then; it can cover no
          new decision.
        </Notice>
      )}
      {d.withdrawn && (
        <Notice tone="caution" title={`Withdrawn ${formatDateTime(d.withdrawn.at)}${d.withdrawn.by ? ` by ${d.withdrawn.by}` : ''}`}>
          {d.withdrawn.reason}
        </Notice>
      )}
      {editing ? (
        <DeviationForm deviation={d} onSaved={() => setEditing(false)} onCancel={() => setEditing(false)} />
      ) : (
        <Panel
          title="What it allows"
          actions={
            mayEdit && (
              <Button look="secondary" onClick={() => setEditing(true)}>
                Correct…
              </Button>
            )
          }
        >
          <p className="text-sm whitespace-pre-line" data-testid="deviation-allowed">
            {d.allowed}
          </p>
          <div className="mt-3">
            <Details
              columns={4}
              items={[
                ['Retardance tolerance', d.retardanceTolWaves === null ? 'As ordered' : `± ${d.retardanceTolWaves} λ`],
                ['Fast-axis tolerance', d.axisTolDeg === null ? 'As ordered' : `± ${d.axisTolDeg}°`],
                ['Pieces', d.quantityLimit === null ? 'Not recorded' : `${d.quantityUsed} used, ${d.quantityLeft} of ${d.quantityLimit} left`],
                ['Last day of use', d.expiresOn ?? 'Not recorded'],
                ['Written by', d.createdBy ? `${d.createdBy}, ${formatDateTime(d.createdAt)}` : formatDateTime(d.createdAt)],
              ]}
            />
          </div>
        </Panel>
      )}
      <div className="grid gap-3 lg:grid-cols-2">
        <Panel title="Approvals">
          {d.approvalsSigned.length === 0 && <p className="text-sm text-ink-faint">None signed yet.</p>}
          <ul className="space-y-2 text-sm">
            {d.approvalsSigned.map((a) => (
              <li key={a.slot}>
                <strong>{a.slot === 'quality' ? 'Quality manager' : 'Second approver'}:</strong> {a.approver}, {formatDateTime(a.signedAt)}
                <p className="text-xs text-ink-muted">{a.meaning}</p>
              </li>
            ))}
          </ul>
          {mayApprove && <ApprovalForm deviation={d} />}
        </Panel>
        <Panel title="Uses">
          {d.uses.length === 0 && <p className="text-sm text-ink-faint">No decision has used it yet.</p>}
          <ul className="space-y-1 text-sm">
            {d.uses.map((u, i) => (
              <li key={i} className={u.releasedAt ? 'text-ink-faint line-through' : ''}>
                {plural(u.quantity, 'piece')} {u.source === 'lot' ? 'of lot' : 'of an NCR of lot'}{' '}
                {u.lotId ? <Link to={`/lots/${u.lotId}`}>{lotName(u.lotId)}</Link> : '—'}, {formatDateTime(u.usedAt)}
                {u.releasedAt && <span className="ml-1 no-underline">(decision superseded {formatDateTime(u.releasedAt)})</span>}
              </li>
            ))}
          </ul>
        </Panel>
      </div>
      {mayWithdraw && <WithdrawForm deviation={d} />}
    </div>
  );
}

function ApprovalForm({ deviation }: { deviation: DeviationView }) {
  const approve = useApproveDeviation(deviation.id);
  const slot = deviation.approvals === 0 ? 'quality' : 'second';
  const form = useForm<DeviationApprovalInput>({
    resolver: zodResolver(deviationApprovalSchema),
    defaultValues: { password: '', meaningAcknowledged: false as unknown as true },
  });
  const submit = form.handleSubmit((values) =>
    approve.mutate(values, {
      onSuccess: () => form.reset(),
      onError: () => {
        form.setValue('password', '');
        form.setFocus('password');
      },
    }),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Approve deviation" className="mt-3 space-y-3 border-t border-paper-line pt-3">
      <p className="text-sm font-medium">
        {slot === 'quality' ? 'First approval (a quality manager)' : 'Second approval (another quality manager or an administrator)'}
      </p>
      {approve.error && <Notice tone="error">{approve.error.message}</Notice>}
      <SignatureFields meaning={DEVIATION_APPROVAL_MEANINGS[slot]} register={form.register} errors={form.formState.errors} idPrefix="approve" />
      <Button type="submit" disabled={approve.isPending}>
        {approve.isPending ? 'Signing…' : 'Sign the approval'}
      </Button>
    </form>
  );
}

function WithdrawForm({ deviation }: { deviation: DeviationView }) {
  const withdraw = useWithdrawDeviation(deviation.id);
  const [open, setOpen] = useState(false);
  const form = useForm<{ reason: string }>({ resolver: zodResolver(deviationWithdrawalSchema), defaultValues: { reason: '' } });
  if (!open) {
    return (
      <Button look="secondary" onClick={() => setOpen(true)}>
        Withdraw this deviation…
      </Button>
    );
  }
  return (
    <form
      onSubmit={form.handleSubmit((values) => withdraw.mutate(values))}
      noValidate
      aria-label="Withdraw deviation"
      className="space-y-3 rounded border border-state-fail/40 bg-paper-card p-4"
    >
      <p className="text-sm">A withdrawn deviation covers no further decision; decisions already signed under it stand.</p>
      {withdraw.error && <Notice tone="error">{withdraw.error.message}</Notice>}
      <Field label="Why it is withdrawn" htmlFor="withdraw-reason" error={form.formState.errors.reason?.message}>
        <textarea id="withdraw-reason" rows={2} className={inputClass} {...form.register('reason')} />
      </Field>
      <div className="flex gap-2">
        <Button type="submit" look="danger" disabled={withdraw.isPending}>
          Withdraw
        </Button>
        <Button look="quiet" onClick={() => setOpen(false)}>
          Keep it
        </Button>
      </div>
    </form>
  );
}
