// Public: the supplier answers a corrective-action request through the mailed link, without an
// account. The link's token is read from the URL's fragment (never sent in a URL to the server).
import { useMemo, useRef, useState } from 'react';
import { useLocation } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import {
  MAX_RESPONSE_FILE_BYTES,
  MAX_RESPONSE_FILES,
  supplierResponseSchema,
  type SupplierRequestView,
  type SupplierResponseInput,
} from '@shared/schemas/correctiveActions';
import { BrandMark } from '@/components/BrandMark';
import { Button } from '@/components/Button';
import { Details } from '@/components/Details';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useSubmitResponse, useSupplierRequest } from '../api';
import { formatDateTime } from '@shared/format';

export function SupplierResponsePage() {
  const { hash } = useLocation();
  const token = useMemo(() => new URLSearchParams(hash.replace(/^#/, '')).get('token') ?? '', [hash]);
  const request = useSupplierRequest(token);
  const [sentAt, setSentAt] = useState<string | null>(null);
  return (
    <div className="min-h-screen">
      <header className="bg-frame py-4 text-white">
        <div className="mx-auto flex max-w-3xl items-center gap-2 px-4 sm:px-6">
          <BrandMark />
          <span className="ml-2 text-sm text-white/70">Corrective-action answer</span>
        </div>
      </header>
      <main className="mx-auto max-w-3xl space-y-5 px-4 py-6 sm:px-6">
        {!token && <Notice tone="error">This page needs the link from the request mail. Open the link exactly as it was mailed to you.</Notice>}
        {request.isPending && token && <p className="text-ink-muted">Opening the request…</p>}
        {request.error && (
          <Notice tone="error" title="The request cannot be opened">
            {request.error.message}
          </Notice>
        )}
        {sentAt && (
          <Notice tone="info" title="Thank you: your answer was received">
            It was recorded on {formatDateTime(sentAt)} and sent to the buyer and quality, who will review it. This link takes no further answer.
          </Notice>
        )}
        {request.data && !sentAt && <RequestSummary view={request.data} />}
        {request.data && !sentAt && <AnswerForm token={token} onSent={setSentAt} />}
      </main>
    </div>
  );
}

function RequestSummary({ view }: { view: SupplierRequestView }) {
  return (
    <section aria-label="The request" className="space-y-3">
      <div>
        <h1>Corrective action {view.number}</h1>
        <p className="mt-1 text-sm text-ink-muted">
          For {view.supplier}: {view.part.number}, {view.part.description}.
        </p>
      </div>
      {view.returnedNote && (
        <Notice tone="caution" title="Your earlier answer was returned">
          {view.returnedNote}
        </Notice>
      )}
      <div className="rounded border border-paper-line bg-paper-card px-4 py-3">
        <Details
          columns={2}
          items={[
            ['Answer due', view.responseDueOn],
            ['This link works until', view.linkExpiresAt.slice(0, 10)],
          ]}
        />
        <p className="mt-3 text-sm whitespace-pre-line">{view.problem}</p>
        <ul className="mt-3 space-y-1 text-sm">
          {view.ncrs.map((n) => (
            <li key={n.number}>
              <span className="font-mono font-medium">{n.number}</span>: {n.description}
              {n.serials.length > 0 && <span className="block font-mono text-xs break-words text-ink-muted">Serials {n.serials.join(', ')}</span>}
            </li>
          ))}
        </ul>
      </div>
    </section>
  );
}

function AnswerForm({ token, onSent }: { token: string; onSent(at: string): void }) {
  const submit = useSubmitResponse(token);
  const files = useRef<HTMLInputElement>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const form = useForm<SupplierResponseInput>({
    resolver: zodResolver(supplierResponseSchema),
    defaultValues: {
      responderName: '',
      rootCause: '',
      containment: '',
      correctiveActions: '',
      preventiveActions: '',
      containmentOn: '',
      correctiveDueOn: '',
      preventiveDueOn: '',
    },
  });
  const errors = form.formState.errors;
  const send = form.handleSubmit((values) => {
    const chosen = [...(files.current?.files ?? [])];
    if (chosen.length > MAX_RESPONSE_FILES) return setFileError(`At most ${MAX_RESPONSE_FILES} files`);
    // Said before a large file is sent at all; the server refuses it the same way.
    const tooLarge = chosen.filter((file) => file.size > MAX_RESPONSE_FILE_BYTES);
    if (tooLarge.length) return setFileError(`${tooLarge.map((file) => file.name).join(', ')}: larger than 10 MB`);
    setFileError(null);
    const body = new FormData();
    for (const [name, value] of Object.entries(values)) if (value) body.append(name, String(value));
    for (const file of chosen) body.append('files', file);
    submit.mutate(body, { onSuccess: (answer) => onSent(answer.submittedAt), onError: (error) => showServerFieldErrors(error, form.setError) });
  });
  const text = (name: 'rootCause' | 'containment' | 'correctiveActions' | 'preventiveActions', label: string, hint: string) => (
    <Field label={label} htmlFor={`answer-${name}`} hint={hint} error={errors[name]?.message}>
      <textarea id={`answer-${name}`} rows={3} className={inputClass} {...form.register(name)} />
    </Field>
  );
  const date = (name: 'containmentOn' | 'correctiveDueOn' | 'preventiveDueOn', label: string) => (
    <Field label={label} htmlFor={`answer-${name}`} error={errors[name]?.message}>
      <input id={`answer-${name}`} {...isoDateInput} className={inputClass} {...form.register(name)} />
    </Field>
  );
  return (
    <form onSubmit={send} noValidate aria-label="Your answer" className="space-y-3 rounded border border-paper-line bg-paper-card p-4">
      <h2>Your answer</h2>
      {submit.error && <Notice tone="error">{submit.error.message}</Notice>}
      <Field label="Your name" htmlFor="answer-responderName" error={errors.responderName?.message}>
        <input id="answer-responderName" autoComplete="name" className={`${inputClass} max-w-sm`} {...form.register('responderName')} />
      </Field>
      {text('rootCause', 'Root cause', 'Why the nonconformance happened, as found.')}
      {text('containment', 'Containment', 'What was done with parts already made, shipped or in stock.')}
      {text('correctiveActions', 'Corrective actions', 'What removes the cause.')}
      {text('preventiveActions', 'Preventive actions', 'What keeps it, and similar causes, from coming back.')}
      <div className="grid gap-3 sm:grid-cols-3">
        {date('containmentOn', 'Containment in place on')}
        {date('correctiveDueOn', 'Corrective actions in effect by')}
        {date('preventiveDueOn', 'Preventive actions by')}
      </div>
      <Field
        label="Files (optional)"
        htmlFor="answer-files"
        hint={`PDF, PNG or JPEG, up to 10 MB each, at most ${MAX_RESPONSE_FILES}.`}
        error={fileError ?? undefined}
      >
        <input id="answer-files" ref={files} type="file" multiple accept="application/pdf,image/png,image/jpeg" className="block text-sm" />
      </Field>
      <p className="text-xs text-ink-muted">The link takes one answer: check it before sending. Your network address is recorded with it.</p>
      <Button type="submit" disabled={submit.isPending}>
        {submit.isPending ? 'Sending…' : 'Send the answer'}
      </Button>
    </form>
  );
}
