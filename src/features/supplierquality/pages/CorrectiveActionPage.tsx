import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { zodResolver } from '@hookform/resolvers/zod';
import { Paperclip } from 'lucide-react';
import { can } from '@shared/policies';
import {
  CAR_ACCEPT_MEANING,
  CAR_CLOSE_MEANING,
  carCloseSchema,
  carReviewSchema,
  type CarCloseInput,
  type CarResponseView,
  type CarReviewInput,
  type CarView,
} from '@shared/schemas/correctiveActions';
import { lotName } from '@shared/schemas/stock';
import { Button } from '@/components/Button';
import { Details, Panel } from '@/components/Details';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { SignatureFields } from '@/components/SignatureFields';
import { StateBadge } from '@/components/StateBadge';
import { useSession } from '@/lib/session';
import { useCloseRequest, useCorrectiveAction, useReviewResponse, useRevokeLink, useSendNewLink } from '../api';
import { RequestBadge } from '../components/Badges';
import { formatDate, formatDateTime } from '@shared/format';

export function CorrectiveActionPage() {
  const id = Number(useParams().requestId);
  const { data: user } = useSession();
  const query = useCorrectiveAction(id);
  if (query.error) return <Notice tone="error">{query.error.message}</Notice>;
  if (!query.data) return <p className="text-ink-muted">Loading…</p>;
  const car = query.data;
  const mayReview = can(user, 'corrective.review');
  return (
    <div className="max-w-5xl space-y-3">
      <PageHeader
        title={`Corrective action ${car.number}`}
        subtitle={
          <>
            {car.part.number} · {car.part.description} from {car.supplier.name} · <Link to="/corrective-actions">all requests</Link>
          </>
        }
        actions={<RequestBadge status={car.status} overdue={car.overdue} />}
      />
      <Panel title="The request">
        <Details
          columns={4}
          items={[
            ['Sent to', car.sentTo],
            ['Answer due', car.responseDueOn],
            ['Raised', `${car.requestedBy ?? 'a former user'}, ${formatDateTime(car.requestedAt)}`],
            [
              'NCRs',
              <span key="ncrs" className="flex flex-wrap gap-x-2">
                {car.nonconformances.map((n) => (
                  <Link key={n.id} to={`/nonconformances/${n.id}`} className="font-mono">
                    {n.number}
                  </Link>
                ))}
              </span>,
            ],
          ]}
        />
        <p className="mt-3 text-sm whitespace-pre-line">{car.problem}</p>
      </Panel>
      <LinkPanel car={car} mayManage={can(user, 'corrective.manage')} />
      <section aria-label="Answers" className="space-y-3">
        <h2 className="text-sm font-semibold">Answers from the supplier</h2>
        {car.responseHistory.length === 0 && <p className="text-sm text-ink-faint">No answer yet.</p>}
        {car.responseHistory.map((r, i) => (
          <ResponseCard key={r.id} car={car} response={r} latest={i === 0} />
        ))}
      </section>
      {mayReview && car.status === 'responded' && <ReviewForm car={car} />}
      {car.status === 'accepted' && (
        <Notice tone="info" title={`Accepted by ${car.acceptedBy ?? 'quality'}, ${formatDateTime(car.acceptedAt!)}`}>
          Check the lots of {car.part.number} that arrive from now on; close the request once they show the action worked.
        </Notice>
      )}
      {mayReview && car.status === 'accepted' && <CloseForm car={car} />}
      {car.status === 'closed' && (
        <Panel title="Effectiveness verified">
          <p className="text-sm">
            Closed by {car.closedBy ?? 'quality'}, {formatDateTime(car.closedAt!)}: {car.effectivenessNote}
          </p>
          <p className="mt-1 text-sm">
            Lots checked:{' '}
            {car.checkedLots.map((l, i) => (
              <span key={l.id}>
                {i > 0 && ', '}
                <Link to={`/lots/${l.id}`}>{lotName(l.id)}</Link> ({l.decision ?? 'undecided'})
              </span>
            ))}
          </p>
        </Panel>
      )}
    </div>
  );
}

function LinkPanel({ car, mayManage }: { car: CarView; mayManage: boolean }) {
  const revoke = useRevokeLink(car.id);
  const renew = useSendNewLink(car.id);
  const live = car.links.find((l) => l.live);
  const error = revoke.error ?? renew.error;
  return (
    <Panel title="Links to answer">
      {error && <Notice tone="error">{error.message}</Notice>}
      <ul className="space-y-1 text-sm">
        {car.links.map((l) => (
          <li key={l.id} className="flex flex-wrap items-center gap-2">
            <span>
              Sent {formatDateTime(l.issuedAt)}, valid until {formatDate(l.expiresAt)}
            </span>
            {l.live && <StateBadge state="live" label="Live" tone="pass" />}
            {l.submittedAt && <StateBadge state="used" label={`Answered ${formatDate(l.submittedAt)}`} tone="neutral" />}
            {l.revokedAt && <StateBadge state="revoked" label={`Revoked ${formatDate(l.revokedAt)}`} tone="fail" />}
            {!l.live && !l.submittedAt && !l.revokedAt && <StateBadge state="expired" label="Expired" tone="neutral" />}
          </li>
        ))}
      </ul>
      {mayManage && car.status === 'awaiting-response' && (
        <div className="mt-3 flex flex-wrap gap-2 border-t border-paper-line pt-3">
          {live && (
            <Button look="secondary" disabled={revoke.isPending} onClick={() => revoke.mutate(undefined)}>
              Revoke the link
            </Button>
          )}
          <Button look="secondary" disabled={renew.isPending} onClick={() => renew.mutate(undefined)}>
            Send a new link
          </Button>
          <span className="self-center text-xs text-ink-muted">A new link replaces the live one; it goes to {car.sentTo}.</span>
        </div>
      )}
    </Panel>
  );
}

function ResponseCard({ car, response: r, latest }: { car: CarView; response: CarResponseView; latest: boolean }) {
  const review =
    r.review === 'accepted' ? (
      <StateBadge state="accepted" label="Accepted" tone="pass" />
    ) : r.review === 'returned' ? (
      <StateBadge state="returned" label="Returned" tone="fail" />
    ) : (
      <StateBadge state="to-review" label="To review" tone="hold" />
    );
  return (
    <Panel title={`${r.responderName}, ${formatDateTime(r.submittedAt)}`} actions={review}>
      <div className={latest ? '' : 'opacity-80'}>
        <Details
          columns={2}
          items={[
            ['Root cause', r.rootCause],
            ['Containment', `${r.containment}${r.containmentOn ? ` (in place ${r.containmentOn})` : ''}`],
            ['Corrective actions', `${r.correctiveActions} (in effect by ${r.correctiveDueOn})`],
            ['Preventive actions', `${r.preventiveActions}${r.preventiveDueOn ? ` (by ${r.preventiveDueOn})` : ''}`],
          ]}
        />
        {r.attachments.length > 0 && (
          <ul className="mt-2 flex flex-wrap gap-3 text-sm">
            {r.attachments.map((a) => (
              <li key={a.id}>
                <a href={`/api/corrective-actions/${car.id}/attachments/${a.id}`} target="_blank" rel="noreferrer" className="inline-flex items-center gap-1">
                  <Paperclip className="h-3.5 w-3.5" aria-hidden /> {a.name}
                </a>{' '}
                <span className="text-xs text-ink-faint">({a.size < 1024 ? `${a.size} B` : `${Math.ceil(a.size / 1024)} kB`})</span>
              </li>
            ))}
          </ul>
        )}
        <p className="mt-2 text-xs text-ink-faint">Sent from {r.address ?? 'an unknown address'}.</p>
        {r.review && (
          <p className="mt-1 text-sm">
            {r.review === 'accepted' ? 'Accepted' : 'Returned'} by {r.reviewedBy}, {formatDateTime(r.reviewedAt!)}
            {r.reviewNote && `: ${r.reviewNote}`}
          </p>
        )}
      </div>
    </Panel>
  );
}

function ReviewForm({ car }: { car: CarView }) {
  const review = useReviewResponse(car.id);
  const form = useForm<z.input<typeof carReviewSchema>, unknown, CarReviewInput>({
    resolver: zodResolver(carReviewSchema),
    defaultValues: { decision: 'accept', note: '', password: '', meaningAcknowledged: false as unknown as true },
  });
  const decision = form.watch('decision');
  const errors = form.formState.errors as Partial<Record<'decision' | 'note' | 'password' | 'meaningAcknowledged', { message?: string }>>;
  const submit = form.handleSubmit((values) =>
    review.mutate(values, {
      onError: () => {
        if (decision === 'accept') form.setValue('password', '');
      },
    }),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Review the answer" className="space-y-3 rounded border border-frame/30 bg-paper-card p-4">
      <h2>Review the answer</h2>
      {review.error && <Notice tone="error">{review.error.message}</Notice>}
      <fieldset className="flex flex-wrap gap-4 text-sm">
        <legend className="mb-1 text-xs font-medium text-ink-muted">Decision</legend>
        <label className="inline-flex items-center gap-1.5">
          <input type="radio" value="accept" {...form.register('decision')} /> Accept the answer
        </label>
        <label className="inline-flex items-center gap-1.5">
          <input type="radio" value="return" {...form.register('decision')} /> Return it to the supplier
        </label>
      </fieldset>
      <Field
        label={decision === 'return' ? 'What the answer lacks (the supplier reads this)' : 'Note (optional)'}
        htmlFor="review-note"
        error={errors.note?.message}
      >
        <textarea id="review-note" rows={2} className={inputClass} {...form.register('note')} />
      </Field>
      {decision === 'accept' ? (
        <SignatureFields meaning={CAR_ACCEPT_MEANING} register={form.register as never} errors={errors as never} idPrefix="review" />
      ) : (
        <p className="text-xs text-ink-muted">Returning sends {car.sentTo} a new link with your note.</p>
      )}
      <Button type="submit" disabled={review.isPending}>
        {decision === 'accept' ? 'Sign: accept the answer' : 'Return with a new link'}
      </Button>
    </form>
  );
}

function CloseForm({ car }: { car: CarView }) {
  const close = useCloseRequest(car.id);
  const decided = car.laterLots.filter((l) => l.decision !== null);
  const [lots, setLots] = useState<number[]>([]);
  const form = useForm<z.input<typeof carCloseSchema>, unknown, CarCloseInput>({
    resolver: zodResolver(carCloseSchema),
    defaultValues: { lotIds: [], note: '', password: '', meaningAcknowledged: false as unknown as true },
  });
  const errors = form.formState.errors;
  const toggle = (lotId: number, on: boolean) => {
    const next = on ? [...lots, lotId] : lots.filter((l) => l !== lotId);
    setLots(next);
    form.setValue('lotIds', next, { shouldValidate: form.formState.isSubmitted });
  };
  return (
    <form
      onSubmit={form.handleSubmit((values) => close.mutate(values, { onError: () => form.setValue('password', '') }))}
      noValidate
      aria-label="Close the request"
      className="space-y-3 rounded border border-paper-line bg-paper-card p-4"
    >
      <h2>Verify effectiveness and close</h2>
      {close.error && <Notice tone="error">{close.error.message}</Notice>}
      <fieldset>
        <legend className="mb-1 text-xs font-medium text-ink-muted">Later lots checked (received since the answer was accepted, and decided)</legend>
        {decided.length === 0 && (
          <p className="text-sm text-ink-faint">
            No lot of {car.part.number} from {car.supplier.name} has been received and decided since the answer was accepted.
          </p>
        )}
        <ul className="space-y-1 text-sm">
          {decided.map((l) => (
            <li key={l.id}>
              <label className="inline-flex items-center gap-2">
                <input type="checkbox" checked={lots.includes(l.id)} onChange={(e) => toggle(l.id, e.target.checked)} /> {lotName(l.id)} · supplier lot{' '}
                {l.supplierLot} · {l.decision} · received {formatDate(l.receivedAt)}
              </label>
            </li>
          ))}
        </ul>
        {errors.lotIds && (
          <p role="alert" className="text-xs text-state-fail">
            {errors.lotIds.message}
          </p>
        )}
      </fieldset>
      <Field label="What the later lots showed" htmlFor="close-note" error={errors.note?.message}>
        <textarea id="close-note" rows={2} className={inputClass} {...form.register('note')} />
      </Field>
      <SignatureFields meaning={CAR_CLOSE_MEANING} register={form.register} errors={errors} idPrefix="close" />
      <Button type="submit" disabled={close.isPending || decided.length === 0}>
        Sign: close the request
      </Button>
    </form>
  );
}
