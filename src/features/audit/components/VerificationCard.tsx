import { CheckCircle2, ShieldAlert, XCircle } from 'lucide-react';
import type { VerificationResult } from '@shared/schemas/certificates';
import { formatDateTime } from '@shared/format';

const KIND_LABELS = { certificate: 'Certificate of conformance', 'inspection-report': 'Inspection report' } as const;

function verdictOf(result: VerificationResult) {
  if (!result.genuine) return { title: 'Not genuine', tone: 'border-state-fail/40 bg-state-fail/5 text-state-fail', Icon: XCircle };
  if (result.current) return { title: 'Genuine and current', tone: 'border-state-pass/40 bg-state-pass/5 text-state-pass', Icon: CheckCircle2 };
  return { title: 'Genuine, but revoked', tone: 'border-signal-deep/50 bg-signal/10 text-ink', Icon: ShieldAlert };
}

/** The site's answer, and only what the document itself shows. */
export function VerificationCard({ result }: { result: VerificationResult }) {
  const { title, tone, Icon } = verdictOf(result);
  return (
    <section aria-label="Verification result" className={`rounded border px-4 py-3 ${tone}`}>
      <h2 className="flex items-center gap-2">
        <Icon className="h-5 w-5" aria-hidden /> {title}
      </h2>
      <p className="mt-1 text-sm text-ink">{result.message}</p>
      {result.genuine && (
        <dl className="mt-3 grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm text-ink">
          <dt className="text-ink-muted">Number</dt>
          <dd className="font-mono">{result.document.number}</dd>
          <dt className="text-ink-muted">Document</dt>
          <dd>{KIND_LABELS[result.document.kind]}</dd>
          <dt className="text-ink-muted">Issued</dt>
          <dd>{formatDateTime(result.document.issuedAt)}</dd>
          {result.document.revokedAt && (
            <>
              <dt className="text-ink-muted">Revoked</dt>
              <dd>{formatDateTime(result.document.revokedAt)}</dd>
            </>
          )}
          <dt className="text-ink-muted">Part</dt>
          <dd>{result.document.part}</dd>
          <dt className="text-ink-muted">Supplier</dt>
          <dd>{result.document.supplier}</dd>
          <dt className="text-ink-muted">Supplier lot</dt>
          <dd className="font-mono">{result.document.supplierLot}</dd>
          <dt className="text-ink-muted">Decision</dt>
          <dd>{result.document.decision}</dd>
        </dl>
      )}
    </section>
  );
}
